declare module '#auth-utils' {
  interface User {
    id: string
  }
  interface UserSession {
    // The account's session version when the session was made (see server/utils/gate.ts).
    sv: number
    loggedInAt: number
  }
}

export {}
