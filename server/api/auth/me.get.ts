import { meOf } from '../../domain/people'

export default defineEventHandler(async event => meOf(await requireActor(event)))
