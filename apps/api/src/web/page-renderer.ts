import { existsSync, readFileSync } from "node:fs";
import { readFile } from "node:fs/promises";
import { createRequire } from "node:module";
import { join } from "node:path";
import { pathToFileURL } from "node:url";
import type { RequestHandler } from "express";

/** What the web app's server entry (apps/web/src/entry-server.ts) takes and gives back. */
interface RenderRequest {
  url: string;
  template: string;
  manifest?: Record<string, string[]>;
  fetch: typeof fetch;
  origin: string;
  preferences: { units?: string; acceptLanguage?: string };
}
interface RenderResult {
  html: string;
  status: number;
  rendered: boolean;
}
type RenderPage = (request: RenderRequest) => Promise<RenderResult>;

/** Renders one page; `shell` is the bare page for the browser to draw (when the render fails). */
export interface PageRenderer {
  render(request: Omit<RenderRequest, "template" | "manifest">): Promise<RenderResult>;
  shell(): Promise<string>;
  /** Development: Vite's own middleware (modules, hot reload); comes before the pages. */
  middleware?: RequestHandler;
  /** Development: rewrites a stack trace to the source files. */
  fixStack?(error: Error): void;
}

/** The shell without a render: the template's placeholders filled with nothing. */
function bareShell(template: string): string {
  return template
    .replace("<!--app-head-->", '<title>Grainyard</title><meta name="robots" content="noindex">')
    .replace("<!--app-html-->", "")
    .replace("<!--app-state-->", "");
}

/**
 * The built app (apps/web/dist): `client/` (the page template and the browser's files) and
 * `server/entry-server.js` (the render, every dependency bundled in). Without the server bundle
 * every page is the shell, drawn in the browser.
 */
export function builtRenderer(webDist: string): PageRenderer {
  const template = readFileSync(join(webDist, "client", "index.html"), "utf8");
  const manifestFile = join(webDist, "client", ".vite", "ssr-manifest.json");
  const manifest = existsSync(manifestFile) ? (JSON.parse(readFileSync(manifestFile, "utf8")) as Record<string, string[]>) : undefined;
  const serverEntry = join(webDist, "server", "entry-server.js");
  let renderPage: Promise<RenderPage> | null = null;
  const load = () => (renderPage ??= import(pathToFileURL(serverEntry).href).then((module: { render: RenderPage }) => module.render));

  return {
    async render(request) {
      if (!existsSync(serverEntry)) return { html: bareShell(template), status: 200, rendered: false };
      return (await load())({ ...request, template, manifest });
    },
    shell: async () => bareShell(template),
  };
}

/** The little of Vite's API used here (Vite is the web app's dependency, not the API's). */
interface ViteDevServer {
  middlewares: RequestHandler;
  transformIndexHtml(url: string, html: string): Promise<string>;
  ssrLoadModule(url: string): Promise<Record<string, unknown>>;
  ssrFixStacktrace(error: Error): void;
}
interface ViteModule {
  createServer(config: Record<string, unknown>): Promise<ViteDevServer>;
}

/**
 * `npm run dev`: Vite in middleware mode inside the API. Pages are rendered from the source
 * (`ssrLoadModule`), the browser's modules are served by Vite, and edits reload at once. Vite
 * is loaded from the web app's own dependencies; it is never part of a production image.
 */
export async function developmentRenderer(webRoot: string, hmrPort: number | undefined): Promise<PageRenderer> {
  const viteEntry = createRequire(join(webRoot, "package.json")).resolve("vite");
  const vite = (await import(pathToFileURL(viteEntry).href)) as ViteModule;
  const server = await vite.createServer({
    root: webRoot,
    configFile: join(webRoot, "vite.config.ts"),
    appType: "custom",
    server: { middlewareMode: true, ...(hmrPort ? { ws: { port: hmrPort, host: "127.0.0.1" } } : {}) },
  });
  const templateFile = join(webRoot, "index.html");
  return {
    async render(request) {
      const template = await server.transformIndexHtml(request.url, await readFile(templateFile, "utf8"));
      const { render } = (await server.ssrLoadModule("/src/entry-server.ts")) as { render: RenderPage };
      return render({ ...request, template });
    },
    shell: async () => bareShell(await server.transformIndexHtml("/", await readFile(templateFile, "utf8"))),
    middleware: server.middlewares,
    fixStack: (error) => server.ssrFixStacktrace(error),
  };
}
