// Weekly fit of every crew's FSRS parameters (scheduled in nuxt.config's nitro.scheduledTasks).
import { fitAllCrews } from '../../domain/crew-fits'

export default defineTask({
  meta: { name: 'fsrs:fit-crews', description: 'Fit each crew\'s FSRS parameters to its own calls; adopt them only where they predict unseen calls better' },
  async run() {
    const result = await fitAllCrews(useSqlite())
    return { result }
  },
})
