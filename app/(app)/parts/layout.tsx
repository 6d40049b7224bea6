import { capabilityLayout } from "@/lib/auth/segment";

export default capabilityLayout("parts:manage");
