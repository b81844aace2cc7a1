// The route table. Views load lazily so the first page stays small; the signed-in shell is the parent
// route, and sign-in, password reset, invitation and not-found pages sit outside it.
import type { RouteRecordRaw } from 'vue-router';
import { ROLES, type Role } from '@/api/types';

/** Every route name; links and redirects use these, never raw paths. */
export type RouteName = 'sign-in' | 'forgot-password' | 'reset-password' | 'invitation' | 'home' | 'account' | 'club-members' | 'not-found'
  | 'garage' | 'car' | 'build-sheet' | 'check-run'
  | 'review-queue' | 'submission' | 'cage-record' | 'club-records' | 'verify' | 'verify-code'
  | 'dev-mailbox' | 'club-activity'
  | 'rulebooks' | 'rulebook-version' | 'rulebook-compare'
  | 'tube-choice' | 'tube-stock' | 'build-journal' | 'side-by-side'
  | 'fabrication';

declare module 'vue-router' {
  interface RouteMeta {
    /** Reachable without signing in. */
    public?: boolean;
    /** Needs one of these roles in the club of `params.clubId` (or the current club when absent). */
    roles?: readonly Role[];
    /** Page title, shown in the browser tab. */
    title?: string;
  }
}

type NamedRoute = RouteRecordRaw & { name?: RouteName; children?: NamedRoute[] };

export const routes: NamedRoute[] = [
  {
    path: '/sign-in',
    name: 'sign-in',
    component: () => import('@/views/SignInView.vue'),
    meta: { public: true, title: 'Sign in' },
  },
  {
    path: '/forgot-password',
    name: 'forgot-password',
    component: () => import('@/views/ForgotPasswordView.vue'),
    meta: { public: true, title: 'Forgot your password?' },
  },
  {
    path: '/reset-password/:token',
    name: 'reset-password',
    component: () => import('@/views/ResetPasswordView.vue'),
    meta: { public: true, title: 'Choose a new password' },
  },
  {
    path: '/invitations/:token',
    name: 'invitation',
    component: () => import('@/views/InvitationView.vue'),
    meta: { public: true, title: 'Invitation' },
  },
  // The check at the track: public, outside the shell, made for a phone.
  { path: '/verify', name: 'verify', component: () => import('@/views/VerifyView.vue'), meta: { public: true, title: 'Check a cage record' } },
  { path: '/verify/:code', name: 'verify-code', component: () => import('@/views/VerifyView.vue'), meta: { public: true, title: 'Check a cage record' } },
  {
    path: '/',
    component: () => import('@/layout/AppLayout.vue'),
    children: [
      {
        path: '',
        name: 'home',
        component: () => import('@/views/HomeView.vue'),
        meta: { title: 'Overview' },
      },
      {
        path: 'account',
        name: 'account',
        component: () => import('@/views/AccountView.vue'),
        meta: { title: 'Account' },
      },
      {
        path: 'clubs/:clubId/members',
        name: 'club-members',
        component: () => import('@/views/ClubMembersView.vue'),
        meta: { roles: ['admin'], title: 'Members' },
      },
      { path: 'bench', name: 'fabrication', component: () => import('@/views/FabricationView.vue'), meta: { title: 'Bench tools' } },
      { path: 'garage', name: 'garage', component: () => import('@/views/GarageView.vue'), meta: { title: 'Garage' } },
      { path: 'cars/:carId', name: 'car', component: () => import('@/views/CarView.vue'), meta: { title: 'Car' } },
      { path: 'build-sheets/:sheetId', name: 'build-sheet', component: () => import('@/views/BuildSheetView.vue'), meta: { title: 'Build sheet' } },
      { path: 'build-sheets/:sheetId/tubes', name: 'tube-choice', component: () => import('@/views/TubeChoiceView.vue'), meta: { title: 'Lightest legal tubes' } },
      { path: 'build-sheets/:sheetId/side-by-side', name: 'side-by-side', component: () => import('@/views/SideBySideView.vue'), meta: { title: 'Rulebooks side by side' } },
      { path: 'build-sheets/:sheetId/journal', name: 'build-journal', component: () => import('@/views/BuildJournalView.vue'), meta: { title: 'Build journal' } },
      { path: 'clubs/:clubId/tube-stock', name: 'tube-stock', component: () => import('@/views/TubeStockView.vue'), meta: { roles: ROLES, title: 'Tube stock' } },
      { path: 'dev/mailbox', name: 'dev-mailbox', component: () => import('@/views/MailboxView.vue'), meta: { roles: ['admin'], title: 'Mailbox' } },
      { path: 'clubs/:clubId/activity', name: 'club-activity', component: () => import('@/views/AuditLogView.vue'), meta: { roles: ['admin'], title: 'Activity log' } },
      { path: 'check-runs/:checkRunId', name: 'check-run', component: () => import('@/views/CheckRunView.vue'), meta: { title: 'Check run' } },
      { path: 'clubs/:clubId/review', name: 'review-queue', component: () => import('@/views/ReviewQueueView.vue'), meta: { roles: ['steward', 'admin'], title: 'Review queue' } },
      { path: 'submissions/:submissionId', name: 'submission', component: () => import('@/views/SubmissionView.vue'), meta: { title: 'Review' } },
      { path: 'clubs/:clubId/records', name: 'club-records', component: () => import('@/views/ClubRecordsView.vue'), meta: { roles: ['steward', 'admin'], title: 'Cage records' } },
      { path: 'cage-records/:recordId', name: 'cage-record', component: () => import('@/views/CageRecordView.vue'), meta: { title: 'Cage record' } },
      { path: 'clubs/:clubId/rulebooks', name: 'rulebooks', component: () => import('@/views/RulebooksView.vue'), meta: { roles: ['admin'], title: 'Rulebooks' } },
      { path: 'ruleset-versions/:versionId', name: 'rulebook-version', component: () => import('@/views/RulebookVersionView.vue'), meta: { roles: ['admin'], title: 'Rulebook' } },
      { path: 'ruleset-versions/:versionId/compare/:otherId', name: 'rulebook-compare', component: () => import('@/views/RulebookCompareView.vue'), meta: { roles: ['admin'], title: 'What changed' } },
    ],
  },
  {
    path: '/:pathMatch(.*)*',
    name: 'not-found',
    component: () => import('@/views/NotFoundView.vue'),
    meta: { public: true, title: 'Not found' },
  },
];
