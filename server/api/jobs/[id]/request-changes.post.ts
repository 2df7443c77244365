export default defineJobMoveHandler('requestChanges')
