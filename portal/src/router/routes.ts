import type { Role } from '@localis/shared';
import type { RouteRecordRaw } from 'vue-router';
import './route-meta';

/** Campaigns are read by everyone who works on or judges them; billing contacts see invoices only. */
export const CAMPAIGN_READERS: Role[] = ['researcher', 'pi', 'committee', 'admin'];
/** Drafting is for the people in research groups. */
export const CAMPAIGN_AUTHORS: Role[] = ['researcher', 'pi'];
/** Runs are recorded by the group's members and PI, and by the office. */
export const RUN_RECORDERS: Role[] = ['researcher', 'pi', 'admin'];
/** Invoices and rate cards are the office's and the paying partners' billing contacts'. */
export const BILLING_READERS: Role[] = ['admin', 'billing'];

/** Every page of the portal. Later slices add their feature's routes here. */
export const routes: RouteRecordRaw[] = [
  {
    path: '/sign-in',
    name: 'sign-in',
    component: () => import('../views/auth/sign-in-view.vue'),
    meta: { title: 'Sign in', guestOnly: true },
  },
  {
    path: '/not-a-member',
    name: 'not-a-member',
    component: () => import('../views/auth/not-a-member-view.vue'),
    meta: { title: 'Not a member yet' },
  },
  {
    path: '/signed-out',
    name: 'signed-out',
    component: () => import('../views/auth/signed-out-view.vue'),
    meta: { title: 'Signed out' },
  },
  {
    path: '/',
    name: 'home',
    component: () => import('../views/home/home-view.vue'),
    meta: { title: 'Home', requiresAuth: true },
  },
  {
    path: '/profile',
    name: 'profile',
    component: () => import('../views/profile/profile-view.vue'),
    meta: { title: 'Your profile', requiresAuth: true },
  },
  {
    path: '/campaigns',
    name: 'campaigns',
    component: () => import('../views/campaigns/campaigns-view.vue'),
    meta: { title: 'Campaigns', requiresAuth: true, roles: CAMPAIGN_READERS },
  },
  {
    path: '/campaigns/new',
    name: 'campaign-new',
    component: () => import('../views/campaigns/campaign-form-view.vue'),
    meta: { title: 'New campaign', requiresAuth: true, roles: CAMPAIGN_AUTHORS },
  },
  {
    path: '/campaigns/:id',
    name: 'campaign-detail',
    component: () => import('../views/campaigns/campaign-detail-view.vue'),
    props: true,
    meta: { title: 'Campaign', requiresAuth: true, roles: CAMPAIGN_READERS },
  },
  {
    path: '/campaigns/:id/edit',
    name: 'campaign-edit',
    component: () => import('../views/campaigns/campaign-form-view.vue'),
    props: true,
    meta: { title: 'Edit campaign', requiresAuth: true, roles: CAMPAIGN_AUTHORS },
  },
  {
    path: '/campaigns/:id/ledger',
    name: 'campaign-ledger',
    component: () => import('../views/campaigns/campaign-ledger-view.vue'),
    props: true,
    meta: { title: 'Ledger', requiresAuth: true, roles: CAMPAIGN_READERS },
  },
  {
    path: '/campaigns/:id/runs',
    name: 'campaign-runs',
    component: () => import('../views/campaigns/campaign-runs-view.vue'),
    props: true,
    meta: { title: 'Runs', requiresAuth: true, roles: CAMPAIGN_READERS },
  },
  {
    path: '/campaigns/:id/runs/import',
    name: 'campaign-runs-import',
    component: () => import('../views/campaigns/campaign-import-view.vue'),
    props: true,
    meta: { title: 'Import runs', requiresAuth: true, roles: RUN_RECORDERS },
  },
  {
    path: '/campaigns/:id/archives',
    name: 'campaign-archives',
    component: () => import('../views/campaigns/campaign-archives-view.vue'),
    props: true,
    meta: { title: 'Archives', requiresAuth: true, roles: CAMPAIGN_READERS },
  },
  {
    path: '/campaigns/:id/analysis',
    name: 'campaign-analysis',
    component: () => import('../views/campaigns/campaign-analysis-view.vue'),
    props: true,
    meta: { title: 'Analysis', requiresAuth: true, roles: CAMPAIGN_READERS },
  },
  {
    path: '/campaigns/:id/print',
    name: 'campaign-print',
    component: () => import('../views/campaigns/campaign-print-view.vue'),
    props: true,
    meta: { title: 'Campaign for print', requiresAuth: true, roles: CAMPAIGN_READERS, printable: true },
  },
  {
    path: '/campaigns/:id/decision',
    name: 'campaign-decision',
    component: () => import('../views/campaigns/campaign-decision-view.vue'),
    props: true,
    meta: { title: 'Decide on a proposal', requiresAuth: true, roles: ['admin'] },
  },
  {
    path: '/committee',
    name: 'committee',
    component: () => import('../views/committee/committee-queue-view.vue'),
    meta: { title: 'Committee', requiresAuth: true, roles: ['committee', 'admin'] },
  },
  {
    path: '/admin/rounds',
    name: 'admin-rounds',
    component: () => import('../views/admin/rounds/rounds-view.vue'),
    meta: { title: 'Rounds', requiresAuth: true, roles: ['admin'] },
  },
  {
    path: '/admin/rounds/:id/usage',
    name: 'admin-round-usage',
    component: () => import('../views/admin/rounds/round-usage-view.vue'),
    props: true,
    meta: { title: 'Pool usage', requiresAuth: true, roles: ['admin', 'committee'] },
  },
  {
    path: '/admin/people',
    name: 'admin-people',
    component: () => import('../views/admin/people/people-view.vue'),
    meta: { title: 'People', requiresAuth: true, roles: ['admin'] },
  },
  {
    path: '/admin/institutions',
    name: 'admin-institutions',
    component: () => import('../views/admin/institutions/institutions-view.vue'),
    meta: { title: 'Institutions', requiresAuth: true, roles: ['admin'] },
  },
  {
    path: '/admin/audit',
    name: 'admin-audit',
    component: () => import('../views/admin/audit/audit-view.vue'),
    meta: { title: 'Audit log', requiresAuth: true, roles: ['admin'] },
  },
  {
    path: '/invoices',
    name: 'invoices',
    component: () => import('../views/billing/invoices-view.vue'),
    meta: { title: 'Invoices', requiresAuth: true, roles: BILLING_READERS },
  },
  {
    path: '/invoices/:id',
    name: 'invoice-detail',
    component: () => import('../views/billing/invoice-detail-view.vue'),
    props: true,
    meta: { title: 'Invoice', requiresAuth: true, roles: BILLING_READERS },
  },
  {
    path: '/institutions/:id/rate-cards',
    name: 'institution-rate-cards',
    component: () => import('../views/billing/rate-cards-view.vue'),
    props: true,
    meta: { title: 'Rate cards', requiresAuth: true, roles: BILLING_READERS },
  },
  {
    path: '/not-allowed',
    name: 'not-allowed',
    component: () => import('../views/errors/not-allowed-view.vue'),
    meta: { title: 'Not allowed', requiresAuth: true },
  },
  {
    path: '/:pathMatch(.*)*',
    name: 'not-found',
    component: () => import('../views/errors/not-found-view.vue'),
    meta: { title: 'Page not found' },
  },
];
