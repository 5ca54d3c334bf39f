export default defineEventHandler(event => ownClassProgress(event))
