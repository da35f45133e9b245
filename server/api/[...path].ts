// Any /api path that names no route answers a JSON 404 (not the page renderer).
export default defineEventHandler((event) => {
  throw createError({ statusCode: 404, message: `There is no ${event.method} ${event.path.split('?')[0]} in the Glint API.` })
})
