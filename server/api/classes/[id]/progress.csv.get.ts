export default defineEventHandler(async (event) => {
  const progress = await ownClassProgress(event)
  setResponseHeader(event, 'content-type', 'text/csv; charset=utf-8')
  setResponseHeader(event, 'content-disposition', `attachment; filename="class-${progress.classId}-progress.csv"`)
  return progressCsv(progress)
})
