export default defineJobMoveHandler('approve')
