import { z } from 'zod'
import { Token } from '#shared/schemas/auth'
import { openInvitation } from '../../domain/invitation-lookup'
import { invitationPreview } from '../../domain/invitations'

export default defineEventHandler(async (event) => {
  const { token } = await queryInput(event, z.object({ token: Token }))
  return invitationPreview(openInvitation(token))
})
