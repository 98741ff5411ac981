import type { Role } from '@localis/shared';
import { SafeRedirect } from '@localis/shared';
import type { RouteMeta } from 'vue-router';
import './route-meta';

export interface SessionView {
  signedIn: boolean;
  roles: readonly Role[];
}

export interface NavigationTarget {
  fullPath: string;
  meta: RouteMeta;
  query: Record<string, unknown>;
}

export type NavigationDecision =
  | { kind: 'allow' }
  | { kind: 'sign-in'; redirect: string }
  | { kind: 'not-allowed'; from: string }
  | { kind: 'go'; path: string };

/** A redirect target we may follow: a path of this site only, never another origin. */
export function safeRedirect(value: unknown, fallback = '/'): string {
  const candidate = Array.isArray(value) ? value[0] : value;
  const parsed = SafeRedirect.safeParse(candidate);
  return parsed.success ? parsed.data : fallback;
}

/**
 * The one rule of the router guard, kept pure so it can be tested without a router.
 * The server enforces every rule again; this only keeps people off pages that would fail.
 */
export function decideNavigation(to: NavigationTarget, session: SessionView): NavigationDecision {
  const { meta } = to;
  if (meta.guestOnly && session.signedIn) return { kind: 'go', path: safeRedirect(to.query.redirect) };
  if (!meta.requiresAuth) return { kind: 'allow' };
  if (!session.signedIn) return { kind: 'sign-in', redirect: to.fullPath };
  const needed = meta.roles ?? [];
  if (needed.length > 0 && !needed.some((role) => session.roles.includes(role))) {
    return { kind: 'not-allowed', from: to.fullPath };
  }
  return { kind: 'allow' };
}

export function pageTitle(title: string | undefined): string {
  return title ? `${title} · Localis` : 'Localis';
}
