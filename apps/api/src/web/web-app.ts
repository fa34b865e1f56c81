import { existsSync } from "node:fs";
import { join } from "node:path";
import express, { Router, type NextFunction, type Request, type Response } from "express";
import type { DataSource } from "typeorm";
import type { AppConfig } from "../config.ts";
import type { ReplicaReads } from "../db/read-replica.ts";
import type { Logger } from "../logger.ts";
import { seoRoutes } from "../routes/seo-routes.ts";
import { createSeoService } from "../services/seo-service.ts";
import { loopbackFetch } from "./loopback-fetch.ts";
import { builtRenderer, developmentRenderer, type PageRenderer } from "./page-renderer.ts";

export interface WebAppDependencies {
  config: AppConfig;
  logger: Logger;
  dataSource: DataSource;
  /** The sitemaps read from the replica when one is configured. */
  reads?: ReplicaReads;
}

/** The person's unit choice from its cookie (the web app's `grainyard_units`); no other cookie is read. */
function unitsCookie(req: Request): string | undefined {
  return /(?:^|;\s*)grainyard_units=(metric|imperial)(?:;|$)/.exec(req.headers.cookie ?? "")?.[1];
}

/**
 * Everything the API serves that is not the API: robots.txt and the sitemaps, the web app's
 * built files, and its pages. Public pages are rendered on the server (apps/web/src/entry-server.ts)
 * as anyone not signed in sees them; private pages get the shell and are drawn in the browser.
 * With `WEB_DEV_ROOT` (npm run dev) the pages come from the source through Vite instead.
 */
export function webApp({ config, logger, dataSource, reads }: WebAppDependencies): Router {
  const router = Router();
  router.use(seoRoutes(createSeoService({ dataSource, reads, publicUrl: config.publicUrl })));

  const webDist = config.webDist;
  const built = webDist && existsSync(join(webDist, "client", "index.html"));
  if (!config.webDev && !built) return router;

  let renderer: Promise<PageRenderer>;
  if (config.webDev) {
    const { root, hmrPort } = config.webDev;
    renderer = developmentRenderer(root, hmrPort);
    // Vite's hot-reload socket is on its own port: let the page's scripts reach it.
    if (hmrPort) {
      router.use((_req: Request, res: Response, next: NextFunction) => {
        const policy = res.getHeader("content-security-policy");
        if (typeof policy === "string")
          res.setHeader("content-security-policy", policy.replace("connect-src 'self'", `connect-src 'self' ws://127.0.0.1:${hmrPort}`));
        next();
      });
    }
    router.use((req: Request, res: Response, next: NextFunction) => {
      renderer.then((vite) => vite.middleware!(req, res, next), next);
    });
  } else {
    const client = join(webDist!, "client");
    renderer = Promise.resolve(builtRenderer(webDist!));
    // Vite names built scripts, styles and fonts by their content, so a browser may keep them for good;
    // one that is missing is a 404, never the app's page in its place.
    router.use(
      "/assets",
      express.static(join(client, "assets"), { index: false, immutable: true, maxAge: "365d" }),
      (_req: Request, res: Response) => {
        res.status(404).type("text/plain").send("Not found");
      },
    );
    // The page template is only ever sent filled in.
    router.get("/index.html", (_req, res) => res.redirect(301, "/"));
    router.use(
      express.static(client, {
        index: false,
        maxAge: config.environment === "production" ? "1h" : 0,
        setHeaders: (res, path) => {
          // The service worker and its registration are checked on every visit, so an update reaches everyone.
          if (/(?:^|\/)(?:sw|registerSW)\.js$/.test(path)) res.setHeader("cache-control", "no-cache");
        },
      }),
    );
  }

  // An address that looks like a file and was not found is a plain 404, never a rendered page.
  router.use((req: Request, res: Response, next: NextFunction) => {
    if (req.method === "GET" && /\.[a-z0-9]{1,8}$/i.test(req.path)) res.status(404).type("text/plain").send("Not found");
    else next();
  });

  router.get("/{*path}", async (req: Request, res: Response) => {
    const pages = await renderer;
    let status: number;
    let html: string;
    try {
      ({ status, html } = await pages.render({
        url: req.originalUrl,
        fetch: loopbackFetch(req),
        origin: config.publicUrl,
        preferences: { units: unitsCookie(req), acceptLanguage: req.headers["accept-language"] },
      }));
    } catch (error) {
      if (error instanceof Error) pages.fixStack?.(error);
      logger.error({ err: error, url: req.originalUrl }, "server render failed; sending the shell");
      // The browser can still draw the page from the shell.
      status = 500;
      html = await pages.shell();
    }
    // Nothing personal is in the page, but it is in the person's units and language.
    res.setHeader("cache-control", "no-cache");
    res.vary("Cookie").vary("Accept-Language");
    res.status(status).type("html").send(html);
  });
  return router;
}
