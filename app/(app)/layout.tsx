import { AppShell } from "@/components/shell/app-shell";
import { requirePage } from "@/lib/auth/guard";

export default async function AppLayout({ children }: { children: React.ReactNode }) {
  const auth = await requirePage();
  return <AppShell auth={auth}>{children}</AppShell>;
}
