// Attempts left unsent by an earlier visit (offline, signed out, server down) go out as soon
// as the app is up; the outbox then keeps retrying on its own.
export default defineNuxtPlugin({
  name: 'attempt-outbox',
  setup() {
    const outbox = useAttemptOutbox()
    onNuxtReady(() => outbox.flush())
  },
})
