/** Every URL the web app links to, built in one place. */
export const paths = {
  home: '/',
  signIn: '/auth/login',
  signOut: '/auth/logout',
} as const;
