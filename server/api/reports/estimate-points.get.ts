import { defineReportRoute } from '../../services/reports/route'

export default defineReportRoute('estimate-points')
