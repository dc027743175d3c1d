import { SELF } from "cloudflare:test";
import { expect, it } from "vitest";

it("serves the catalog", async () => {
  const res = await SELF.fetch("https://example.com/api/v1/designs");
  expect(res.status).toBe(200);
  const body = await res.json<{ designs: Array<{ id: string }> }>();
  expect(body.designs.map((d) => d.id)).toContain("two-means");
});
