export default defineEventHandler(event => sendDrillExport(event, 'mid'))
