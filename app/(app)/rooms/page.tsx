import type { Metadata } from "next";
import { requirePagePermission } from "@/lib/auth/guard";
import { listRooms } from "@/db/access/rooms/list-rooms";
import { RoomsManager } from "./_components/rooms-manager";

export const metadata: Metadata = { title: "Rooms" };
export const dynamic = "force-dynamic";

export default async function RoomsPage() {
  const user = await requirePagePermission("rooms.manage", "/rooms");
  const rooms = await listRooms(user);
  return (
    <div className="max-w-3xl space-y-6">
      <div>
        <h1 className="text-display">Rooms</h1>
        <p className="text-ink-soft">The Timetable books sessions in these rooms. A room out of use keeps its past and booked sessions.</p>
      </div>
      <RoomsManager rooms={rooms} />
    </div>
  );
}
