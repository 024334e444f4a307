"use client";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { ScrollArea } from "@/components/ui/scroll-area";
import { createRoomAction, setRoomActiveAction, updateRoomAction } from "../actions";

interface Room {
  id: string;
  name: string;
  capacity: number | null;
  active: boolean;
  upcomingSessions: number;
}

type Errors = Record<string, string[]>;

/** The list of rooms, a form to add one, and per room: rename (with capacity) and take out of / back into use. */
export function RoomsManager({ rooms }: { rooms: Room[] }) {
  const router = useRouter();
  const [key, setKey] = useState(() => crypto.randomUUID());
  const [errors, setErrors] = useState<Errors>({});
  const [message, setMessage] = useState<string | null>(null);
  const [editing, setEditing] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  async function add(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const form = e.currentTarget;
    const f = new FormData(form);
    setBusy(true);
    const res = await createRoomAction({
      name: String(f.get("name") ?? ""),
      capacity: String(f.get("capacity") ?? ""),
      idempotencyKey: key,
    });
    setBusy(false);
    if (res.ok) {
      setErrors({});
      setMessage(`${res.data.name} added.`);
      setKey(crypto.randomUUID());
      form.reset();
      router.refresh();
    } else {
      setErrors(res.fieldErrors ?? {});
      setMessage(res.message);
    }
  }

  async function save(e: React.FormEvent<HTMLFormElement>, roomId: string) {
    e.preventDefault();
    const f = new FormData(e.currentTarget);
    setBusy(true);
    const res = await updateRoomAction({ roomId, name: String(f.get("name") ?? ""), capacity: String(f.get("capacity") ?? "") });
    setBusy(false);
    if (res.ok) {
      setErrors({});
      setEditing(null);
      setMessage(`Saved as ${res.data.name}.`);
      router.refresh();
    } else {
      setErrors(res.fieldErrors ?? {});
      setMessage(res.message);
    }
  }

  async function toggle(room: Room) {
    setBusy(true);
    const res = await setRoomActiveAction({ roomId: room.id, active: !room.active });
    setBusy(false);
    setMessage(res.ok ? `${room.name} is ${res.data.active ? "back in use" : "out of use"}.` : res.message);
    if (res.ok) router.refresh();
  }

  const err = (prefix: string, name: string) =>
    errors[name] ? (
      <p id={`${prefix}${name}-error`} className="field-error">
        {errors[name][0]}
      </p>
    ) : null;

  return (
    <div className="space-y-6">
      <form onSubmit={add} className="card grid gap-3 sm:grid-cols-[2fr_1fr_auto] sm:items-end" aria-label="Add a room" noValidate>
        <div>
          <label htmlFor="room-name" className="field-label">
            Name
          </label>
          <input
            id="room-name"
            name="name"
            className="field-input"
            maxLength={100}
            required
            aria-invalid={editing === null && errors.name ? true : undefined}
            aria-describedby={editing === null && errors.name ? "new-name-error" : undefined}
          />
          {editing === null && err("new-", "name")}
        </div>
        <div>
          <label htmlFor="room-capacity" className="field-label">
            Seats (optional)
          </label>
          <input id="room-capacity" name="capacity" type="number" min={1} max={1000} inputMode="numeric" className="field-input num" />
          {editing === null && err("new-", "capacity")}
        </div>
        <button type="submit" className="btn-primary" disabled={busy}>
          Add the room
        </button>
      </form>
      <div aria-live="polite">
        {message && (
          <p className="text-ink-soft" data-testid="rooms-message">
            {message}
          </p>
        )}
      </div>
      {rooms.length === 0 ? (
        <p className="text-ink-soft">No rooms yet: add the first one above.</p>
      ) : (
        <ScrollArea label="Rooms">
          <table className="data-table w-full" data-testid="rooms-table">
            <thead>
              <tr>
                <th scope="col">Room</th>
                <th scope="col">Seats</th>
                <th scope="col">In use</th>
                <th scope="col">Sessions ahead</th>
                <th scope="col">
                  <span className="sr-only">Changes</span>
                </th>
              </tr>
            </thead>
            <tbody>
              {rooms.map((r) =>
                editing === r.id ? (
                  <tr key={r.id}>
                    <td colSpan={5}>
                      <form
                        onSubmit={(e) => save(e, r.id)}
                        className="flex flex-wrap items-end gap-3"
                        aria-label={`Change ${r.name}`}
                        noValidate
                      >
                        <div>
                          <label htmlFor={`name-${r.id}`} className="field-label">
                            Name
                          </label>
                          <input id={`name-${r.id}`} name="name" defaultValue={r.name} maxLength={100} required className="field-input" />
                          {err("edit-", "name")}
                        </div>
                        <div>
                          <label htmlFor={`capacity-${r.id}`} className="field-label">
                            Seats
                          </label>
                          <input
                            id={`capacity-${r.id}`}
                            name="capacity"
                            type="number"
                            min={1}
                            max={1000}
                            defaultValue={r.capacity ?? ""}
                            className="field-input num"
                          />
                          {err("edit-", "capacity")}
                        </div>
                        <button type="submit" className="btn-primary" disabled={busy}>
                          Save
                        </button>
                        <button type="button" className="btn-quiet" onClick={() => setEditing(null)}>
                          Keep as it was
                        </button>
                      </form>
                    </td>
                  </tr>
                ) : (
                  <tr key={r.id}>
                    <td>{r.name}</td>
                    <td className="num">{r.capacity ?? "—"}</td>
                    <td>{r.active ? "Yes" : "Out of use"}</td>
                    <td className="num">{r.upcomingSessions}</td>
                    <td className="whitespace-nowrap">
                      <button
                        type="button"
                        className="btn-quiet"
                        onClick={() => {
                          setErrors({});
                          setEditing(r.id);
                        }}
                      >
                        Rename<span className="sr-only"> {r.name}</span>
                      </button>{" "}
                      <button type="button" className="btn-quiet" disabled={busy} onClick={() => toggle(r)}>
                        {r.active ? "Take out of use" : "Back into use"}
                        <span className="sr-only"> {r.name}</span>
                      </button>
                    </td>
                  </tr>
                ),
              )}
            </tbody>
          </table>
        </ScrollArea>
      )}
    </div>
  );
}
