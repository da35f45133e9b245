export const ROLES = ['trainee', 'instructor', 'lead', 'admin'] as const
export type Role = (typeof ROLES)[number]

export const ROLE_LABELS: Record<Role, string> = {
  trainee: 'Trainee',
  instructor: 'Instructor',
  lead: 'Lead',
  admin: 'Admin',
}

export interface Me {
  id: string
  email: string
  name: string
  roles: Role[]
  crews: { id: string, name: string }[]
  nightMode: 'auto' | 'day' | 'night'
}
