export type CutFileFormat = 'svg' | 'dxf'

// ASCII DXF is a list of group-code/value line pairs and starts with "0 / SECTION"
// (999 comment groups may come first); SVG starts with XML or <svg>.
const DXF_START_PATTERN = /^\uFEFF?(?:\s*999\r?\n[^\r\n]*\r?\n)*\s*0\r?\n\s*SECTION\s*(?:\r?\n|$)/

/** The format of a cut file's text, decided by its content (never by a file name). Anything not DXF is treated as SVG. */
export function detectCutFileFormat(text: string): CutFileFormat {
  return DXF_START_PATTERN.test(text.slice(0, 4096)) ? 'dxf' : 'svg'
}
