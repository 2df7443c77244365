// The answers of the routes the API tests read, typed from the routes' handlers (utils/api-types.ts): a test that
// reads a field a route no longer sends fails the type check instead of comparing with undefined.
import type { ApiFullList, ApiResponse } from '../../utils/api-types'

export type { JobDetail } from '../../utils/api-types'
export type CatalogOverview = ApiResponse<'/api/catalog/overview'>
export type JobList = ApiFullList<'/api/jobs'>
export type RevisionDetail = ApiResponse<'/api/jobs/:id/files/:fileId/revisions/:revision'>
export type BookingList = ApiResponse<'/api/bookings'>
export type RunSheet = ApiResponse<'/api/run-sheet'>
export type Materials = ApiResponse<'/api/catalog/materials'>
