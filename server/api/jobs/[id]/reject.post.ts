export default defineJobMoveHandler('reject')
