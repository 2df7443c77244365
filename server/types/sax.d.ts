// The part of sax 1.6 (lib/sax.js) the active-content check uses; the package ships no types.
declare module 'sax' {
  export interface QualifiedTag {
    name: string
    attributes: Record<string, string>
  }
  export interface SAXParser {
    ENTITIES: Record<string, string>
    onopentag: (tag: QualifiedTag) => void
    ondoctype: (doctype: string) => void
    ontext: (text: string) => void
    oncdata: (text: string) => void
    oncomment: (text: string) => void
    onerror: (error: Error) => void
    write(chunk: string): SAXParser
    close(): SAXParser
  }
  export function parser(strict: boolean, options?: { position?: boolean; strictEntities?: boolean }): SAXParser
  const sax: { parser: typeof parser }
  export default sax
}
