import { createConfigForNuxt } from '@nuxt/eslint-config/flat'

export default createConfigForNuxt({
  features: { stylistic: false, typescript: true },
}).append({
  ignores: ['.data/**', 'public/**', '.output/**', '.nuxt/**'],
})
