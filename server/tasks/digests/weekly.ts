// The weekly digest to leads (scheduled in nuxt.config's nitro.scheduledTasks; also `npx tsx server/scripts/digests.ts --weekly`).
import { runWeeklyDigests } from '../../domain/digests'

export default defineTask({
  meta: { name: 'digests:weekly', description: 'Weekly digest of the week just ended to each lead of each crew' },
  async run() {
    const result = await runWeeklyDigests(Date.now())
    return { result }
  },
})
