import { setResponseHeader } from 'h3'
import { reportQuerySchema, type ReportName } from '#shared/schemas/reports'
import { requireRole } from '../../utils/auth'
import { useDb } from '../../utils/db'
import { defineApiHandler, readQueryAs } from '../../utils/handler'
import { REPORTS, reportCsv, resolveRange } from './index'

// Every report route is the same handler over a different report, so each route file is one line.
export function defineReportRoute(name: ReportName) {
  return defineApiHandler(async (event) => {
    await requireRole(event, 'staff', 'admin')
    const { format, ...query } = readQueryAs(event, reportQuerySchema)
    const db = useDb()
    const report = await REPORTS[name].build(db, await resolveRange(db, query))
    if (format !== 'csv') return report
    setResponseHeader(event, 'content-type', 'text/csv; charset=utf-8')
    setResponseHeader(event, 'content-disposition', `attachment; filename="kerfbook-${name}-${report.from}-to-${report.to}.csv"`)
    return reportCsv(name, report)
  })
}
