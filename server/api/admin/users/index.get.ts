import { PeopleQuery } from '#shared/schemas/admin'
import { listPeople } from '../../../domain/admin'

// Every account, or those whose name or e-mail holds `q`, a page at a time (newest paging header
// X-Total-Count holds the number that matched). Each person comes with roles and crews.
export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin')
  const { q, page = 1, size = 500 } = await queryInput(event, PeopleQuery)
  const { total, people } = listPeople(q ?? '', page, size)
  setResponseHeader(event, 'X-Total-Count', String(total))
  return people
})
