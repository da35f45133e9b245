import type { H3Event } from 'h3'
import type { z } from 'zod'

// Turns a zod failure into one sentence a person can act on ("email: Enter a valid e-mail address.").
export function describeIssues(error: z.ZodError) {
  const issue = error.issues[0]
  if (!issue) return 'The request is not valid.'
  if (issue.path.length === 0 && issue.code === 'invalid_type') return 'The request body must be a JSON object.'
  const where = issue.path.length ? `${issue.path.join('.')}: ` : ''
  return `${where}${issue.message}`
}

export function validator<T extends z.ZodType>(schema: T) {
  return (value: unknown): z.infer<T> => {
    const result = schema.safeParse(value)
    if (!result.success) {
      throw createError({ statusCode: 400, message: describeIssues(result.error), data: { issues: result.error.issues.slice(0, 5) } })
    }
    return result.data
  }
}

export function readInput<T extends z.ZodType>(event: H3Event, schema: T): Promise<z.infer<T>> {
  return readValidatedBody(event, validator(schema))
}

export function paramsInput<T extends z.ZodType>(event: H3Event, schema: T): Promise<z.infer<T>> {
  return getValidatedRouterParams(event, validator(schema))
}

export function queryInput<T extends z.ZodType>(event: H3Event, schema: T): Promise<z.infer<T>> {
  return getValidatedQuery(event, validator(schema))
}
