import { Providers } from "@/lib/client/providers";

export default function WorkspaceLayout({ children }: { children: React.ReactNode }) {
  return <Providers>{children}</Providers>;
}
