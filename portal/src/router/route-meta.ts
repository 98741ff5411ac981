import type { Role } from '@localis/shared';

export {};

declare module 'vue-router' {
  interface RouteMeta {
    /** Only for signed-in people; others go to sign-in and come back. */
    requiresAuth?: boolean;
    /** Any one of these roles lets a person in; none listed means every signed-in person. */
    roles?: Role[];
    /** Shown as "<title> · Localis". */
    title?: string;
    /** Pages for signed-out people (sign-in): a signed-in person is sent on instead. */
    guestOnly?: boolean;
    /** A page meant for paper: shown without the app's header and navigation. */
    printable?: boolean;
  }
}
