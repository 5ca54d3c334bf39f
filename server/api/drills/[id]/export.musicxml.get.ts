export default defineEventHandler(event => sendDrillExport(event, 'musicxml'))
