/**
 * Why a file could not be analysed. `notSvg` maps to HTTP 415, every other
 * kind to 422; the message is written for the member who uploaded the file.
 */
export type AnalysisInputErrorKind =
  | 'notSvg'
  | 'unsafeXml'
  | 'malformedXml'
  | 'tooComplex'
  | 'badNumber'
  | 'badSize'
  | 'badUnit'
  | 'outOfRange'
  | 'empty'

export class AnalysisInputError extends Error {
  readonly kind: AnalysisInputErrorKind
  readonly status: 415 | 422

  constructor(kind: AnalysisInputErrorKind, memberMessage: string) {
    super(memberMessage)
    this.name = 'AnalysisInputError'
    this.kind = kind
    this.status = kind === 'notSvg' ? 415 : 422
  }
}
