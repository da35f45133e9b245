// Mails carry links built from NUXT_PUBLIC_URL only; say at start, not at the first mail, when it is missing.
export default defineNitroPlugin(() => {
  if (!import.meta.dev && !configuredPublicUrl()) console.error(publicUrlMissingMessage)
})
