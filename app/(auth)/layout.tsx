import Link from "next/link";
import { BenchMark } from "@/components/shell/bench-mark";

/** Signed-out pages: sign-in, invitation and password-reset links. No studio shell. */
export default function AuthLayout({ children }: { children: React.ReactNode }) {
  return (
    <div className="flex min-h-screen flex-col items-center bg-paper px-4 py-12">
      <Link href="/" className="mb-8 flex items-center gap-2 text-xl font-semibold tracking-tight">
        <BenchMark className="size-8" />
        Benchline
      </Link>
      <main className="w-full max-w-sm">{children}</main>
    </div>
  );
}
