import { expect, it } from 'vitest'

it('runs with Nuxt auto-imports', () => {
  const n = ref(1)
  expect(computed(() => n.value + 1).value).toBe(2)
})
