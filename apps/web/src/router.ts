import { createRouter, createWebHistory, type RouteLocationNormalized, type RouteRecordRaw, type RouterHistory } from "vue-router";
import type { Pinia } from "pinia";
import type { Role } from "@grainyard/contracts";
import { SECURITY_PATH, useSessionStore } from "./stores/session.ts";

declare module "vue-router" {
  interface RouteMeta {
    /** Page title, after "Grainyard · ". */
    title?: string;
    /** Roles allowed to see the page; anonymous people are sent to sign in first. */
    roles?: Role[];
    /** Pages for people who are not signed in (signed-in people go to their home). */
    guestOnly?: boolean;
    /**
     * Public pages the server renders (as anyone not signed in would see them) and the browser
     * hydrates; the signed-in parts appear once the session is read. Every other page is sent as
     * the bare app shell and drawn in the browser.
     */
    ssr?: boolean;
    /** Works from this device's own data when there is no connection (the sawyer's listing drafts). */
    offline?: boolean;
  }
}

export const routes: RouteRecordRaw[] = [
  { path: "/", name: "home", component: () => import("./views/HomeView.vue"), meta: { title: "Slabs from city trees", ssr: true } },
  { path: "/browse", name: "browse", component: () => import("./views/BrowseView.vue"), meta: { title: "Browse slabs", ssr: true } },
  {
    path: "/slabs/:listingId",
    name: "slab-page",
    component: () => import("./views/SlabPageView.vue"),
    meta: { title: "Slab for sale", ssr: true },
  },
  {
    path: "/yards/:slug",
    name: "yard-page",
    component: () => import("./views/YardPageView.vue"),
    meta: { title: "A yard on Grainyard", ssr: true },
  },
  {
    path: "/sign-in",
    name: "sign-in",
    component: () => import("./views/SignInView.vue"),
    meta: { title: "Sign in", guestOnly: true },
  },
  {
    // The second sign-in step (a code from the app or a recovery code), after a right password.
    path: "/sign-in/code",
    name: "sign-in-code",
    component: () => import("./views/SignInCodeView.vue"),
    meta: { title: "Enter your code", guestOnly: true },
  },
  {
    path: "/join",
    name: "join",
    component: () => import("./views/SignUpView.vue"),
    meta: { title: "Join", guestOnly: true },
  },
  { path: "/sign-up", redirect: (to) => ({ path: "/join", query: to.query }) },
  {
    path: "/verify-email",
    name: "verify-email",
    component: () => import("./views/VerifyEmailView.vue"),
    meta: { title: "Confirm your e-mail" },
  },
  {
    path: "/forgot-password",
    name: "forgot-password",
    component: () => import("./views/ForgotPasswordView.vue"),
    meta: { title: "Forgot your password" },
  },
  {
    path: "/reset-password",
    name: "reset-password",
    component: () => import("./views/ResetPasswordView.vue"),
    meta: { title: "Choose a new password" },
  },
  {
    path: "/yard",
    name: "yard",
    component: () => import("./views/YardHomeView.vue"),
    meta: { title: "My yard", roles: ["sawyer"] },
  },
  {
    path: "/yard/logs/new",
    name: "log-new",
    component: () => import("./views/LogFormView.vue"),
    meta: { title: "Add a log", roles: ["sawyer"] },
  },
  {
    path: "/yard/logs/:logId/edit",
    name: "log-edit",
    component: () => import("./views/LogFormView.vue"),
    meta: { title: "Edit log", roles: ["sawyer"] },
  },
  {
    path: "/yard/logs/:logId",
    name: "log",
    component: () => import("./views/LogDetailView.vue"),
    meta: { title: "Log", roles: ["sawyer"] },
  },
  {
    path: "/yard/slabs/new",
    name: "slab-new",
    component: () => import("./views/SlabFormView.vue"),
    meta: { title: "Add a slab", roles: ["sawyer"] },
  },
  {
    path: "/yard/slabs/:slabId/edit",
    name: "slab-edit",
    component: () => import("./views/SlabFormView.vue"),
    meta: { title: "Edit slab", roles: ["sawyer"] },
  },
  {
    path: "/yard/slabs/:slabId",
    name: "slab",
    component: () => import("./views/SlabDetailView.vue"),
    meta: { title: "Slab", roles: ["sawyer"] },
  },
  {
    path: "/yard/listings/new",
    name: "listing-new",
    component: () => import("./views/ListingFormView.vue"),
    meta: { title: "New listing", roles: ["sawyer"], offline: true },
  },
  {
    path: "/yard/listings/:listingId",
    name: "listing",
    component: () => import("./views/ListingFormView.vue"),
    meta: { title: "Listing", roles: ["sawyer"], offline: true },
  },
  {
    path: "/yard/payouts",
    name: "payouts",
    component: () => import("./views/PayoutsView.vue"),
    meta: { title: "Payouts", roles: ["sawyer"] },
  },
  {
    path: "/offers",
    name: "offers",
    component: () => import("./views/OffersView.vue"),
    meta: { title: "My offers", roles: ["buyer"] },
  },
  {
    path: "/yard/offers",
    name: "yard-offers",
    component: () => import("./views/OffersView.vue"),
    meta: { title: "Offers on your slabs", roles: ["sawyer"] },
  },
  {
    path: "/orders",
    name: "orders",
    component: () => import("./views/OrdersView.vue"),
    meta: { title: "Orders", roles: ["buyer", "sawyer", "admin"] },
  },
  {
    path: "/orders/:orderId",
    name: "order",
    component: () => import("./views/OrderView.vue"),
    meta: { title: "Order", roles: ["buyer", "sawyer", "admin"] },
  },
  {
    path: "/orders/:orderId/receipt",
    name: "order-receipt",
    component: () => import("./views/ReceiptView.vue"),
    meta: { title: "Receipt", roles: ["buyer", "sawyer", "admin"] },
  },
  {
    path: "/account",
    name: "account",
    component: () => import("./views/AccountView.vue"),
    meta: { title: "My account", roles: ["buyer"] },
  },
  {
    path: SECURITY_PATH,
    name: "account-security",
    component: () => import("./views/AccountSecurityView.vue"),
    meta: { title: "Sign-in security", roles: ["sawyer", "admin"] },
  },
  {
    path: "/saved-searches",
    name: "saved-searches",
    component: () => import("./views/SavedSearchesView.vue"),
    meta: { title: "Saved searches", roles: ["buyer"] },
  },
  {
    path: "/favourites",
    name: "favourites",
    component: () => import("./views/FavouritesView.vue"),
    meta: { title: "Favourites", roles: ["buyer"] },
  },
  {
    path: "/messages",
    name: "messages",
    component: () => import("./views/MessagesView.vue"),
    meta: { title: "Messages", roles: ["buyer", "sawyer"] },
  },
  {
    // The address in message notice e-mails.
    path: "/messages/:threadId",
    name: "thread",
    component: () => import("./views/ThreadView.vue"),
    meta: { title: "Conversation", roles: ["buyer", "sawyer", "admin"] },
  },
  {
    path: "/admin",
    name: "admin",
    component: () => import("./views/AdminHomeView.vue"),
    meta: { title: "Admin dashboard", roles: ["admin"] },
  },
  {
    path: "/admin/review",
    name: "admin-review",
    component: () => import("./views/AdminReviewView.vue"),
    meta: { title: "Listings to review", roles: ["admin"] },
  },
  {
    path: "/admin/reports",
    name: "admin-reports",
    component: () => import("./views/AdminReportsView.vue"),
    meta: { title: "Reports", roles: ["admin"] },
  },
  {
    path: "/admin/problems",
    name: "admin-problems",
    component: () => import("./views/AdminProblemsView.vue"),
    meta: { title: "Problems after hand-over", roles: ["admin"] },
  },
  {
    path: "/admin/buyer-reviews",
    name: "admin-buyer-reviews",
    component: () => import("./views/AdminBuyerReviewsView.vue"),
    meta: { title: "Buyer reviews", roles: ["admin"] },
  },
  {
    path: "/admin/users",
    name: "admin-users",
    component: () => import("./views/AdminUsersView.vue"),
    meta: { title: "Users", roles: ["admin"] },
  },
  {
    path: "/admin/orders",
    name: "admin-orders",
    component: () => import("./views/AdminOrdersView.vue"),
    meta: { title: "Orders", roles: ["admin"] },
  },
  {
    path: "/admin/audit",
    name: "admin-audit",
    component: () => import("./views/AdminAuditView.vue"),
    meta: { title: "Audit log", roles: ["admin"] },
  },
  {
    path: "/admin/settings",
    name: "admin-settings",
    component: () => import("./views/AdminSettingsView.vue"),
    meta: { title: "Marketplace settings", roles: ["admin"] },
  },
  {
    path: "/admin/payouts",
    name: "admin-payouts",
    component: () => import("./views/AdminPayoutsView.vue"),
    meta: { title: "Payouts desk", roles: ["admin"] },
  },
  {
    path: "/admin/outbox",
    name: "admin-outbox",
    component: () => import("./views/AdminOutboxView.vue"),
    meta: { title: "E-mail outbox", roles: ["admin"] },
  },
  {
    path: "/:pathMatch(.*)*",
    name: "not-found",
    component: () => import("./views/NotFoundView.vue"),
    meta: { title: "Page not found", ssr: true },
  },
];

/** Only paths inside this app are followed after sign-in (never another site). */
export function safeNextPath(next: unknown): string | null {
  if (typeof next !== "string") return null;
  if (!next.startsWith("/") || next.startsWith("//") || next.startsWith("/\\")) return null;
  return next;
}

/** Whether the signed-in role may see the page (pages without roles are for everyone). */
export function roleAllowed(route: RouteLocationNormalized, role: Role | null): boolean {
  const roles = route.meta.roles;
  if (!roles || roles.length === 0) return true;
  return role !== null && roles.includes(role);
}

export function createGrainyardRouter(pinia: Pinia, history: RouterHistory = createWebHistory()) {
  const router = createRouter({
    history,
    routes,
    scrollBehavior(to, _from, saved) {
      if (saved) return saved;
      if (to.hash) return { el: to.hash };
      return { top: 0 };
    },
  });

  router.beforeEach(async (to) => {
    // The server renders every page as someone not signed in would see it: it never reads a session.
    if (import.meta.env.SSR) return true;
    // Public pages show at once (and hydrate the server's HTML as it is); App.vue reads the session after.
    if (to.meta.ssr) return true;
    const session = useSessionStore(pinia);
    await session.ensureLoaded();
    // If the session could not be read (offline), let the page render: App shows the offline state.
    if (session.status !== "ready") return true;

    // The code step exists only while a password step waits for its code.
    if (to.name === "sign-in-code" && !session.secondStep && !session.account) {
      return { path: "/sign-in", query: to.query };
    }
    if (to.meta.roles && !session.account) {
      return { path: "/sign-in", query: { next: to.fullPath } };
    }
    // An admin without a second factor sets one up before anything else.
    if (session.secondFactorSetUpNeeded && to.meta.roles && to.path !== SECURITY_PATH) {
      return { path: SECURITY_PATH, query: { next: to.fullPath } };
    }
    // An admin's orders are every order: the desk searches them.
    if (to.name === "orders" && session.role === "admin") return { path: "/admin/orders", query: to.query };
    if (to.meta.guestOnly && session.account) {
      return safeNextPath(to.query.next) ?? session.homePath;
    }
    // A wrong role is not redirected: App.vue shows a plain "not for your account" state.
    return true;
  });

  return router;
}
