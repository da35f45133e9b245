import { z } from 'zod'
import { Id } from './auth'

export const IdParam = z.object({ id: Id })
export const CrewMemberParams = z.object({ id: Id, userId: Id })
