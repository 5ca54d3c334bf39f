// The API's description (/_openapi.json, development only): Nitro 2 lists every server middleware in it as a
// path with an empty name (nitrojs/nitro#3989, fixed in Nitro 3 only), which OpenAPI forbids (each path starts
// with "/") and readers of the description refuse. The middleware are no routes, so that entry goes.
export default defineNitroPlugin((nitroApp) => {
  // The built server serves no description, so it registers nothing here.
  if (!import.meta.dev) return
  nitroApp.hooks.hook('beforeResponse', (event, response) => {
    if (getRequestURL(event).pathname !== OPENAPI_PATH) return
    const paths = (response.body as { paths?: Record<string, unknown> } | undefined)?.paths
    if (paths) delete paths['']
  })
})

const OPENAPI_PATH = '/_openapi.json'
