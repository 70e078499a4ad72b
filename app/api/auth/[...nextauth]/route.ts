import { handlers } from "@/lib/auth";
import { crossSiteRefusal } from "@/lib/api/handler";

export const { GET } = handlers;

/** Auth.js checks its own CSRF token too; the same-origin check of every other route comes first. */
export async function POST(request: Request): Promise<Response> {
  return crossSiteRefusal(request) ?? handlers.POST(request as Parameters<typeof handlers.POST>[0]);
}
