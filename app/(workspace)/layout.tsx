import { Providers } from "@/lib/providers";

export default function WorkspaceLayout({ children }: { children: React.ReactNode }) {
  return <Providers>{children}</Providers>;
}
