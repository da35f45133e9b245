export default defineEventHandler(async event => meOf(await requireActor(event)))
