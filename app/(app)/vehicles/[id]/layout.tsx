import { notFound } from "next/navigation";
import { loadVehicle } from "./load-vehicle";

export default async function VehicleLayout({
  children,
  params,
}: {
  children: React.ReactNode;
  params: Promise<{ id: string }>;
}) {
  const { vehicle } = await loadVehicle((await params).id);
  if (!vehicle) notFound();
  return children;
}
