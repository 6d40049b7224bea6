import { capabilityLayout } from "@/lib/auth/segment";

export default capabilityLayout("known-issues:manage");
