import { createRouter, createWebHistory } from 'vue-router'
import type { RouteLocationRaw } from 'vue-router'
import { AREAS, homeAreaOf } from '@shared/areas'
import type { AreaKey } from '@shared/areas'
import { PERMISSIONS } from '@shared/permissions'
import type { Role } from '@shared/roles'
import { onUnauthenticated } from '@/api/client'
import { lastStationCode } from '@/components/Floor/floorFormat'
import { useSessionStore } from '@/stores/session'

declare module 'vue-router' {
  interface RouteMeta {
    /** Roles that may open the route; absent means any signed-in user. */
    roles?: readonly Role[]
    /** Open without signing in, shown without the app shell. */
    isPublic?: boolean
    /** Signed in, but drawn without the app shell (the Floor brings its own bar). */
    isBare?: boolean
  }
}

/**
 * Where a role lands after signing in: the first area of its work (shared/areas.ts). At the
 * Floor that is the station this device worked at last, so a bench tablet goes straight back
 * to its bench.
 */
export function homePathOf(role: Role): string {
  const home = homeAreaOf(role)
  const station = home.key === 'floor' ? lastStationCode() : null
  return station ? `/floor/${encodeURIComponent(station)}` : home.path
}

/** Access comes from shared/areas.ts, so the navigation and the guard cannot disagree. */
function rolesOf(areaKey: AreaKey): readonly Role[] {
  return AREAS.find((a) => a.key === areaKey)?.roles ?? []
}

export const router = createRouter({
  history: createWebHistory(),
  routes: [
    {
      path: '/signin',
      name: 'signin',
      meta: { isPublic: true },
      component: () => import('@/views/Auth/SignInView.vue'),
    },
    { path: '/', name: 'home', component: () => import('@/views/HomeView.vue') },
    {
      path: '/profile',
      name: 'profile',
      component: () => import('@/views/Auth/ProfileView.vue'),
    },
    {
      path: '/floor',
      name: 'floor-pick',
      meta: { roles: rolesOf('floor') },
      component: () => import('@/views/Floor/FloorPickView.vue'),
    },
    {
      path: '/floor/:stationCode',
      name: 'floor',
      props: true,
      meta: { roles: rolesOf('floor'), isBare: true },
      component: () => import('@/views/Floor/FloorView.vue'),
    },
    {
      path: '/lots',
      name: 'lots',
      meta: { roles: rolesOf('lots') },
      component: () => import('@/views/Lots/LotsView.vue'),
    },
    {
      path: '/lots/:id',
      name: 'lot',
      props: true,
      meta: { roles: rolesOf('lots') },
      component: () => import('@/views/Lots/LotView.vue'),
    },
    {
      path: '/yield',
      name: 'yield',
      meta: { roles: rolesOf('yield') },
      component: () => import('@/views/Yield/YieldView.vue'),
    },
    {
      path: '/recipes',
      name: 'recipes',
      meta: { roles: rolesOf('recipes') },
      component: () => import('@/views/Recipes/RecipesView.vue'),
    },
    {
      path: '/recipes/revisions/:id',
      name: 'revision',
      props: true,
      meta: { roles: ['engineer', 'lead', 'admin', 'operator', 'service', 'stores'] },
      component: () => import('@/views/Recipes/RevisionView.vue'),
    },
    {
      path: '/recipes/parts',
      name: 'parts',
      meta: { roles: PERMISSIONS.readParts },
      component: () => import('@/views/Recipes/PartsView.vue'),
    },
    {
      path: '/recipes/defect-codes',
      name: 'defect-codes',
      meta: { roles: ['engineer', 'lead', 'admin'] },
      component: () => import('@/views/Recipes/DefectCodesView.vue'),
    },
    {
      path: '/receiving',
      name: 'componentLots',
      meta: { roles: rolesOf('receiving') },
      component: () => import('@/views/ComponentLots/ComponentLotsView.vue'),
    },
    {
      path: '/import',
      name: 'import',
      meta: { roles: rolesOf('import') },
      component: () => import('@/views/Import/ImportView.vue'),
    },
    {
      path: '/shipping',
      name: 'shipping',
      meta: { roles: rolesOf('shipping') },
      component: () => import('@/views/Shipping/ShippingView.vue'),
    },
    {
      path: '/service',
      name: 'service',
      meta: { roles: rolesOf('service') },
      component: () => import('@/views/Service/ServiceView.vue'),
    },
    {
      path: '/customers',
      name: 'customers',
      meta: { roles: rolesOf('customers') },
      component: () => import('@/views/Customers/CustomersView.vue'),
    },
    {
      path: '/outbox',
      name: 'outbox',
      meta: { roles: rolesOf('outbox') },
      component: () => import('@/views/Outbox/OutboxView.vue'),
    },
    {
      path: '/trace',
      name: 'trace',
      meta: { roles: rolesOf('trace') },
      component: () => import('@/views/Trace/TraceView.vue'),
    },
    {
      // What a traveler's QR holds (shared/links.ts unitUrl).
      path: '/u/:serial',
      name: 'unit-link',
      props: true,
      meta: { roles: [...new Set([...rolesOf('trace'), ...rolesOf('floor')])] },
      component: () => import('@/views/Trace/UnitLinkView.vue'),
    },
    {
      // What a component lot label's QR holds (shared/links.ts componentLotUrl); any role.
      path: '/c/:code',
      name: 'component-lot-link',
      props: true,
      component: () => import('@/views/Trace/ComponentLotLinkView.vue'),
    },
    {
      path: '/admin/status',
      name: 'status',
      meta: { roles: rolesOf('status') },
      component: () => import('@/views/Admin/StatusView.vue'),
    },
    {
      path: '/admin/stations',
      name: 'stations',
      meta: { roles: rolesOf('stations') },
      component: () => import('@/views/Admin/StationsView.vue'),
    },
    {
      path: '/admin/users',
      name: 'users',
      meta: { roles: rolesOf('users') },
      component: () => import('@/views/Admin/UsersView.vue'),
    },
    {
      path: '/admin/audit',
      name: 'audit',
      meta: { roles: rolesOf('audit') },
      component: () => import('@/views/Admin/AuditView.vue'),
    },
    {
      path: '/:pathMatch(.*)*',
      name: 'not-found',
      component: () => import('@/views/NotFoundView.vue'),
    },
  ],
})

router.beforeEach(async (to): Promise<true | RouteLocationRaw> => {
  const session = useSessionStore()
  if (!session.isKnown) {
    // NOTE: a failed lookup (server down) leaves the session unknown, so the next
    // navigation asks again; meanwhile the sign-in page is the only useful screen.
    await session.load().catch(() => undefined)
  }
  if (to.meta.isPublic) return to.name === 'signin' && session.user ? { name: 'home' } : true
  if (!session.user) {
    return { name: 'signin', query: to.fullPath === '/' ? {} : { next: to.fullPath } }
  }
  if (to.meta.roles && !to.meta.roles.includes(session.user.role)) return { name: 'home' }
  // The home route is only ever a way to the role's home; an explicit `next` after signing in
  // (a traveler's link) never comes here, so it wins.
  if (to.name === 'home') return homePathOf(session.user.role)
  return true
})

// A session can end under an open screen (expiry, an admin deactivating the account):
// forget the user and send them to sign in, coming back here afterwards.
onUnauthenticated(() => {
  const session = useSessionStore()
  if (!session.user) return
  session.user = null
  const here = router.currentRoute.value
  if (!here.meta.isPublic) void router.replace({ name: 'signin', query: { next: here.fullPath } })
})
