import { Router, type Response } from "express";
import { NotFound } from "../errors.ts";
import type { SeoService } from "../services/seo-service.ts";

/** robots.txt and the sitemaps, for search engines (see services/seo-service.ts). */
export function seoRoutes(seo: SeoService) {
  const router = Router();
  const xml = (res: Response) => {
    res.type("application/xml; charset=utf-8");
    res.setHeader("cache-control", "public, max-age=600");
  };
  const stream = async (res: Response, parts: AsyncIterable<string>) => {
    for await (const part of parts) res.write(part);
    res.end();
  };

  router.get("/robots.txt", (_req, res) => {
    res.type("text/plain; charset=utf-8");
    res.setHeader("cache-control", "public, max-age=3600");
    res.send(seo.robotsTxt());
  });
  router.get("/sitemap.xml", async (_req, res) => {
    const plan = await seo.plan();
    xml(res);
    if (plan.kind === "index") res.send(seo.indexXml(plan.slabFiles));
    else await stream(res, seo.allXml());
  });
  router.get("/sitemaps/pages.xml", async (_req, res) => {
    const body = await seo.pagesXml();
    xml(res);
    res.send(body);
  });
  router.get("/sitemaps/slabs-:file.xml", async (req, res) => {
    const parts = await seo.slabsXml(Number(req.params.file));
    if (!parts) throw new NotFound("No such sitemap file.");
    xml(res);
    await stream(res, parts);
  });
  return router;
}
