import { capabilityLayout } from "@/lib/auth/segment";

export default capabilityLayout("comebacks:read");
