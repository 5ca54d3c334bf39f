// Security headers on every reply, and a per-page nonce for the scripts Nuxt renders inline.
export default defineNitroPlugin((nitroApp) => {
  nitroApp.hooks.hook('request', (event) => {
    setResponseHeaders(event, { ...BASE_HEADERS, 'content-security-policy': DATA_POLICY })
  })
  nitroApp.hooks.hook('render:html', (html, { event }) => {
    const nonce = newNonce()
    event.context.cspNonce = nonce
    html.head = addNonce(html.head, nonce)
    html.bodyPrepend = addNonce(html.bodyPrepend, nonce)
    html.body = addNonce(html.body, nonce)
    html.bodyAppend = addNonce(html.bodyAppend, nonce)
  })
  nitroApp.hooks.hook('render:response', (response, { event }) => {
    const headers = (response.headers ??= {})
    delete headers['x-powered-by']
    if (event.context.cspNonce) headers['content-security-policy'] = pagePolicy(event.context.cspNonce)
  })
})
