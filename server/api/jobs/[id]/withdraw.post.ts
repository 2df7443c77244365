export default defineJobMoveHandler('withdraw')
