import { capabilityLayout } from "@/lib/auth/segment";

export default capabilityLayout("campaigns:manage");
