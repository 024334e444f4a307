import { render, screen, fireEvent, waitFor } from "@testing-library/react";
import { lbToKg } from "@/lib/aero";

jest.mock("next/navigation", () => ({ useRouter: () => ({ push: jest.fn(), replace: jest.fn(), refresh: jest.fn() }) }));
const actions = {
  createAirframeAction: jest.fn(),
  updateAirframeAction: jest.fn(),
  duplicateAirframeAction: jest.fn(),
  retireAirframeAction: jest.fn(),
};
jest.mock("@/app/(app)/curve-lab/airframes/actions", () => actions);

/* eslint-disable @typescript-eslint/no-require-imports -- loaded after the mocks above */
const { AirframeForm } =
  require("@/app/(app)/curve-lab/airframes/_components/airframe-form") as typeof import("@/app/(app)/curve-lab/airframes/_components/airframe-form");
const { formValuesFor, airframeFormSchema } = require("@/lib/curve-lab/schema") as typeof import("@/lib/curve-lab/schema");
/* eslint-enable @typescript-eslint/no-require-imports */

function type(label: RegExp | string, value: string) {
  fireEvent.change(screen.getByLabelText(label), { target: { value } });
}

describe("aircraft profile form", () => {
  beforeEach(() => jest.clearAllMocks());

  it("shows a message beside each bad field and calls no server action", async () => {
    render(<AirframeForm airframeId={null} defaults={formValuesFor(null)} />);
    type("Name", "");
    type(/Empty mass/, "1200");
    type(/Maximum mass/, "900");
    type(/Wing area/, "-5");
    type(/Wing span/, "30");
    type(/Oswald efficiency/, "1.4");
    type(/Zero-lift drag coefficient/, "0.03");
    type(/CLmax, clean/, "1.5");
    fireEvent.click(screen.getByRole("button", { name: "Create profile" }));

    expect(await screen.findByTestId("error-name")).toHaveTextContent("Enter a name for the profile");
    expect(screen.getByTestId("error-maxMass")).toHaveTextContent("Maximum mass must be at least the empty mass");
    // lib/aero's own wording, with the form's label in place of the library's field name
    expect(screen.getByTestId("error-wingArea")).toHaveTextContent("Wing area must be a positive finite number");
    expect(screen.getByTestId("error-oswaldEfficiency")).toHaveTextContent("Oswald efficiency must be between 0.1 and 1");
    expect(screen.getByLabelText(/Wing area/)).toHaveAttribute("aria-invalid", "true");
    expect(screen.getByLabelText(/Wing area/)).toHaveAttribute("aria-describedby", "af-wingArea-error");
    expect(screen.getByTestId("form-message")).toHaveTextContent("nothing was saved");
    expect(actions.createAirframeAction).not.toHaveBeenCalled();
  });

  it("reports an impossible aspect ratio on the span, and a configuration's CLmax only when the type has it", async () => {
    render(<AirframeForm airframeId={null} defaults={formValuesFor(null)} />);
    type("Name", "Odd wing");
    type(/Empty mass/, "1200");
    type(/Maximum mass/, "1600");
    type(/Wing area/, "100"); // ft²
    type(/Wing span/, "120"); // ft: aspect ratio 144
    type(/Zero-lift drag coefficient/, "0.03");
    type(/CLmax, clean/, "1.5");
    fireEvent.click(screen.getAllByLabelText("This type has it")[1]!); // flaps 1
    fireEvent.change(screen.getByLabelText("CLmax", { selector: "#af-flaps1-maxLiftCoefficient" }), { target: { value: "9" } });
    fireEvent.click(screen.getByRole("button", { name: "Create profile" }));
    expect(await screen.findByTestId("error-wingSpan")).toHaveTextContent(/aspect ratio of 144; it must be between 1 and 50/);
    expect(screen.getByTestId("error-flaps1.maxLiftCoefficient")).toHaveTextContent("Flaps 1: CLmax must be between 0.1 and 6");
    expect(screen.queryByTestId("error-flaps2.maxLiftCoefficient")).toBeNull();
    expect(actions.createAirframeAction).not.toHaveBeenCalled();
  });

  it("sends a valid profile and the schema converts lb/ft to SI", async () => {
    actions.createAirframeAction.mockResolvedValue({ ok: true, data: { id: "00000000-0000-4000-8000-000000000009" } });
    render(<AirframeForm airframeId={null} defaults={formValuesFor(null)} />);
    type("Name", "Good trainer");
    type(/Empty mass/, "1250");
    type(/Maximum mass/, "1670");
    type(/Wing area/, "125");
    type(/Wing span/, "32");
    type(/Zero-lift drag coefficient/, "0.031");
    type(/CLmax, clean/, "1.5");
    fireEvent.click(screen.getByRole("button", { name: "Create profile" }));
    await waitFor(() => expect(actions.createAirframeAction).toHaveBeenCalledTimes(1));
    const sent = actions.createAirframeAction.mock.calls[0]![0];
    const out = airframeFormSchema.parse(sent);
    expect(out.maxMassKg).toBeCloseTo(lbToKg(1670), 6);
    // 1 ft = 0.3048 m exactly (international foot, 1959): 125 ft² = 125 x 0.09290304 = 11.61288 m², 32 ft = 9.7536 m
    expect(out.wingAreaM2).toBeCloseTo(11.61288, 5);
    expect(out.wingSpanM).toBeCloseTo(9.7536, 4);
    expect(out.configurations.flaps1).toBeNull();
  });
});
