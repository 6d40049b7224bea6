export { PageSkeleton as default } from "@/components/ui/skeleton";
