import Link from "next/link";
import { Wordmark } from "@/components/ui/wordmark";

export default function NotFound() {
  return (
    <main className="mx-auto flex min-h-screen max-w-md flex-col justify-center gap-4 px-6">
      <Wordmark />
      <h1 className="text-xl font-semibold">Nothing here</h1>
      <p className="text-graphite-700">This page does not exist, or you do not have access to it.</p>
      <p>
        <Link href="/">Back to the start</Link>
      </p>
    </main>
  );
}
