import { WorkspaceFrame } from "@/components/editor/workspace-frame";

export default function Loading() {
  return <WorkspaceFrame />;
}
