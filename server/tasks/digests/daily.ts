// The daily reminder to trainees with tracks due (scheduled in nuxt.config's nitro.scheduledTasks; also the command).
import { runDailyReminders } from '../../domain/digests'

export default defineTask({
  meta: { name: 'digests:daily', description: 'Daily reminder to trainees with tracks due who have not opted out' },
  async run() {
    const result = await runDailyReminders(Date.now())
    return { result }
  },
})
