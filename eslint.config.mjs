import { createConfigForNuxt } from '@nuxt/eslint-config/flat'

export default createConfigForNuxt({
  features: { stylistic: false, typescript: true },
}).append(
  {
    ignores: ['.data/**', 'public/**', '.output/**', '.nuxt/**'],
  },
  {
    // The engine has one public door, its index; only the engine itself and its unit tests see its files.
    // The patterns are gitignore-style, where a leading # starts a comment: hence the backslash.
    ignores: ['shared/engine/**', 'tests/unit/engine/**'],
    rules: {
      'no-restricted-imports': ['error', {
        patterns: [{
          group: ['\\#shared/engine/*', '**/shared/engine/*'],
          message: 'Import the engine from its index (#shared/engine), which is its public interface.',
        }],
      }],
    },
  },
)
