import "server-only";
import NextAuth from "next-auth";
import { buildAuthConfig } from "./config";

/** Auth.js entry points. The config is a function so it is built per request, never during the build. */
export const { handlers, auth, signIn, signOut } = NextAuth(() => buildAuthConfig());
