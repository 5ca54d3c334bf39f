// The scheduled weekly summary (nuxt.config.ts: nitro.scheduledTasks), also runnable as a Nitro task.
export default defineTask({
  meta: { name: 'mail:weekly', description: 'Queue the guardians\' weekly practice summaries for the last complete week' },
  async run() {
    const { appUrl } = useRuntimeConfig()
    return { result: await queueWeeklySummaries(useDb(), { appUrl: String(appUrl) }) }
  },
})
