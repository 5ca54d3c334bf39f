import { z } from 'zod'

// zod probes for eval (`new Function`) when a schema is built, to compile faster parsers; the pages' content
// security policy refuses eval, so the browser builds its schemas without it. This runs at import, before any
// other plugin's module builds a schema (plugins load in file-name order).
z.config({ jitless: true })

export default defineNuxtPlugin({ name: 'zod-jitless' })
