import { defineJobMoveHandler } from '../../../services/job-move-route'

export default defineJobMoveHandler('withdraw')
