"""Meaning, unit, typical range and a typical value of each record field, for the schema
(what an editor shows on hover and inserts on completion) and for the message of a missing
key. A field's own ``description`` in the models wins where it has one; this table adds the
typical range and value, and describes the fields the models leave bare.

Keys are ``Model.field`` (the model's name as in the schema's ``$defs``) or ``*.field`` for a
field of that name in every model. Typical ranges are of industrial machines from a few
hundred watts to a few megawatts (common practice, no source); they are guidance for the
reader, never limits: the rules hold the limits.
"""

from __future__ import annotations

from typing import Any

#: key -> (description, examples); an empty description keeps the model's own.
DOCS: dict[str, tuple[str, list[Any]]] = {
    # the record
    "*.schema": ("the record kind and its version", []),
    "*.id": (
        "the record's id, unique in the repository; waivers and reports name it",
        ["pump-drive-4p36s"],
    ),
    "*.title": ("a one-line human title of the design", ["7.5 kW four-pole induction motor"]),
    "*.machine": ("the kind of machine; it chooses the rotor's keys and the rules that apply", []),
    "*.poles": (
        "number of magnetic poles 2p (even); typically 2 to 12, more for slow or"
        " tooth-coil machines",
        [4],
    ),
    "*.rating": ("the rated operating point, as on the nameplate", []),
    "*.stator": ("stator lamination, slots and steel", []),
    "*.winding": ("the stator (armature) winding", []),
    "*.cooling": ("cooling arrangement and coolant temperature", []),
    "*.rotor": ("the rotor: its keys depend on `machine`", []),
    "*.losses": (
        "losses measured or estimated outside emgate, used instead of its own estimates",
        [],
    ),
    "*.declared": (
        "values the design claims, by sheet name (`emgate show` lists them); the"
        " declared-values rule compares each with the recomputed one",
        [{"stator.current_density": "6.6 A/mm^2"}],
    ),
    "*.waivers": ("reviewed exceptions for this record (as in waivers.yaml, without `record`)", []),
    "*.air_gap": ("", ["0.45 mm"]),
    # rating
    "Rating.power": ("", ["7.5 kW"]),
    "Rating.line_voltage": ("", ["400 V"]),
    "Rating.line_current": ("", ["14.6 A"]),
    "Rating.frequency": (
        "rated supply frequency (for an inverter drive the fundamental's);"
        " 50 or 60 Hz on the mains, up to some hundreds of Hz on a drive",
        ["50 Hz"],
    ),
    "Rating.speed": ("", ["1460 rpm"]),
    "Rating.connection": ("connection of the phase windings at the terminals", ["star"]),
    "Rating.operation": ("", ["motor"]),
    "Rating.power_factor": ("", [0.85]),
    "Rating.max_speed": ("", ["3000 rpm"]),
    "Rating.peak_current": ("", ["40 A"]),
    "Rating.converter_max_phase_voltage": ("", ["230 V"]),
    # slots
    "SemiClosedSlot.shape": (
        "a trapezoidal slot with a narrow opening at the gap (random windings)",
        ["semi_closed"],
    ),
    "SemiClosedSlot.opening": (
        "width of the slot opening at the air gap; typically 2 to"
        " 4 mm (stator), 1 to 2 mm (cage rotor)",
        ["2.8 mm"],
    ),
    "SemiClosedSlot.opening_height": (
        "radial height of the opening (the tooth tip); typically 0.5 to 1.5 mm",
        ["0.8 mm"],
    ),
    "SemiClosedSlot.wedge_height": (
        "radial height of the wedge zone below the opening; 0 when"
        " there is no wedge; typically 0 to 3 mm",
        ["1.5 mm"],
    ),
    "SemiClosedSlot.top_width": (
        "slot width at the top of the winding zone (nearer the gap)",
        ["6.4 mm"],
    ),
    "SemiClosedSlot.bottom_width": ("slot width at the bottom of the winding zone", ["9.6 mm"]),
    "SemiClosedSlot.height": (
        "total slot depth from the air gap; typically 10 to 40 mm",
        ["20 mm"],
    ),
    "OpenSlot.shape": ("a rectangular slot open to the gap (form-wound coils)", ["open"]),
    "OpenSlot.width": ("slot width; typically 5 to 20 mm", ["7 mm"]),
    "OpenSlot.height": ("total slot depth from the air gap; typically 20 to 80 mm", ["30 mm"]),
    "OpenSlot.wedge_height": (
        "radial height of the slot wedge; 0 when there is none; typically 2 to 5 mm",
        ["3 mm"],
    ),
    # stator
    "Stator.outer_diameter": (
        "outer diameter of the stator lamination; typically 0.1 to 1 m",
        ["220 mm"],
    ),
    "Stator.bore_diameter": (
        "stator bore diameter (inner diameter of the lamination), some"
        " 0.55 to 0.7 of the outer one",
        ["136 mm"],
    ),
    "Stator.stack_length": (
        "axial length of the lamination stack, ducts included; typically 0.5 to 2 bore diameters",
        ["140 mm"],
    ),
    "Stator.stacking_factor": ("", [0.97]),
    "Stator.steel": ("", ["M400-50A"]),
    "Stator.slots": ("number of stator slots Q; typically 12 to 72", [36]),
    "Stator.slot": ("the stator slot's shape and dimensions", []),
    # conductors
    "*.strands": ("strands in hand: parallel wires forming one conductor; typically 1 to 10", [2]),
    "*.material": (
        "conductor material: annealed copper (IEC 60028) or aluminium (IEC 60889)",
        ["copper"],
    ),
    "RoundConductor.shape": ("a round enamelled wire", ["round"]),
    "RoundConductor.bare_diameter": (
        "copper diameter of one strand, without the enamel; typically 0.3 to 2 mm",
        ["0.9 mm"],
    ),
    "RoundConductor.insulated_diameter": (
        "diameter over the enamel; some 0.05 to 0.1 mm above the bare one",
        ["0.97 mm"],
    ),
    "RectangularConductor.shape": ("a rectangular (profile) strand", ["rectangular"]),
    "RectangularConductor.width": (
        "bare strand width, across the slot; typically 2 to 10 mm",
        ["5 mm"],
    ),
    "RectangularConductor.height": (
        "bare strand height, along the slot; typically 1 to 4 mm",
        ["1.25 mm"],
    ),
    "RectangularConductor.corner_radius": (
        "corner radius of the bare strand (IEC 60317 profiles round their corners); 0 for square",
        ["0.5 mm"],
    ),
    "RectangularConductor.insulated_width": ("strand width over its insulation", ["5.2 mm"]),
    "RectangularConductor.insulated_height": ("strand height over its insulation", ["1.45 mm"]),
    # winding
    "Winding.phases": ("number of phases m; 3 for almost every machine", [3]),
    "Winding.layers": ("coil sides per slot: 1 (single layer) or 2 (double layer)", [2]),
    "Winding.coil_pitch": ("coil span in slot pitches; full pitch is slots / poles", [7]),
    "Winding.turns_per_coil": ("turns of one coil; typically 1 to a few hundred", [21]),
    "Winding.parallel_paths": (
        "parallel paths a of each phase; typically 1 to the number of poles",
        [1],
    ),
    "Winding.conductor": ("the conductor of the winding: round wire or rectangular strand", []),
    "Winding.layout": ("", [["+A -C", "+A -C", "-C +B"]]),
    # cooling
    "Cooling.method": (
        "how the heat leaves: enclosed without or with a fan, open and"
        " ventilated, a liquid jacket or direct liquid cooling",
        ["enclosed_fan"],
    ),
    "Cooling.ambient": ("", ["40 degC"]),
    "Cooling.ambient_min": ("", ["-15 degC"]),
    "Cooling.fin_area_factor": ("", [4.0]),
    "Cooling.frame_length": ("", ["280 mm"]),
    "Cooling.core_area_factor": ("", [3.0]),
    # losses
    "MeasuredLosses.stray_load": ("", ["75 W"]),
    "MeasuredLosses.friction_windage": ("", ["60 W"]),
    "MeasuredLosses.magnet_eddy": ("", ["20 W"]),
    # cage rotor
    "CageRotor.slots": (
        "number of rotor (cage) slots; typically close to, never equal to, the stator's",
        [28],
    ),
    "CageRotor.slot": ("the rotor slot's shape and dimensions, measured from the air gap", []),
    "CageRotor.inner_diameter": ("", ["48 mm"]),
    "CageRotor.cage": ("the squirrel cage: bars and end rings", []),
    "*.steel": (
        "lamination steel grade, built in (such as 'M400-50A') or from the"
        " repository's materials files; the stator's when absent",
        ["M400-50A"],
    ),
    # materials files
    "LossCurveTable.frequency": (
        "the frequency of this loss curve; typically 50 to 400 Hz",
        ["50 Hz"],
    ),
    "*.source": ("", ["supplier data sheet, lot 2611, Epstein test to IEC 60404-2"]),
    "SteelTable.density": (
        "mass density of the steel; typically 7600 to 7800 kg/m^3",
        ["7650 kg/m^3"],
    ),
    "Cage.material": ("cage conductor: die-cast aluminium or fabricated copper", ["aluminium"]),
    "Cage.bar": ("", [{"width": "5 mm", "height": "15 mm"}]),
    "Cage.end_ring": (
        "the end rings' section",
        [{"axial_width": "14 mm", "radial_height": "20 mm"}],
    ),
    "EndRing.axial_width": ("axial width of one end ring; typically 10 to 40 mm", ["14 mm"]),
    "EndRing.radial_height": ("radial height of one end ring; typically 10 to 40 mm", ["20 mm"]),
    "Bar.width": ("width of a fabricated bar", ["5 mm"]),
    "Bar.height": ("radial height of a fabricated bar", ["15 mm"]),
    # magnets
    "MagnetMaterial.remanence": ("", ["1.25 T"]),
    "MagnetMaterial.recoil_permeability": (
        "relative recoil permeability of the magnet; 1.03 to 1.1 for NdFeB and ferrite",
        [1.05],
    ),
    "MagnetMaterial.remanence_temperature_coefficient": (
        "temperature coefficient of the remanence; some -0.1 to -0.12 %/K for NdFeB, -0.2"
        " %/K for ferrite (from memory, manufacturers' data sheets)",
        ["-0.12 %/K"],
    ),
    "MagnetMaterial.intrinsic_coercivity": ("", ["1500 kA/m"]),
    "MagnetMaterial.coercivity_temperature_coefficient": ("", ["-0.6 %/K"]),
    "MagnetMaterial.reference_temperature": ("", ["20 degC"]),
    "Magnet.thickness": ("radial magnet thickness; typically 2 to 10 mm", ["3.5 mm"]),
    "Magnet.pole_arc": ("", [0.8]),
    "Magnet.material": ("the magnet grade's data", []),
    "Magnet.operating_temperature": ("", ["100 degC"]),
    "SurfacePMRotor.magnet": ("the surface magnets", []),
    "SurfacePMRotor.sleeve_thickness": (
        "radial thickness of a non-magnetic retaining sleeve"
        " over the magnets (it adds to the magnetic gap); 0"
        " without one",
        ["0 mm"],
    ),
    "SurfacePMRotor.inner_diameter": ("", ["30 mm"]),
    # salient poles
    "Pole.shoe_arc": ("", [0.68]),
    "Pole.shoe_height": ("radial height of the pole shoe; typically 10 to 30 mm", ["12 mm"]),
    "Pole.body_width": ("width of the pole body (core) that carries the field coil", ["80 mm"]),
    "Pole.body_height": ("radial height of the pole body", ["40 mm"]),
    "FieldCoil.turns_per_pole": ("field-coil turns on one pole; typically 50 to 500", [180]),
    "FieldCoil.current": ("rated (no-load) field current; the load value is recomputed", ["9 A"]),
    "FieldCoil.conductor": ("the field coil's conductor", []),
    "FieldCoil.brushes": ("", ["none"]),
    "SalientRotor.pole": ("one salient pole's dimensions", []),
    "SalientRotor.field": ("the field winding", []),
    "SalientRotor.inner_diameter": ("", ["40 mm"]),
    # waivers
    "*.rule": ("id of the rule the waiver covers, as `emgate rules` lists it", ["slot-fill"]),
    "*.path": ("", ["$.stator.slot"]),
    "*.reason": (
        "why the finding is accepted (at least 10 characters)",
        ["prototype lamination, to be re-cut after the heat run"],
    ),
    "*.owner": ("who answers for the waiver", ["A. Designer"]),
    "*.expires": ("", ["2027-03-31"]),
    "*.record": ("", ["example-4p36s"]),
}


def doc_for(model: str, field: str) -> tuple[str, list[Any]]:
    """The description and examples the table holds for ``model.field`` (else for any model's
    field of that name), or ("", [])."""
    return DOCS.get(f"{model}.{field}") or DOCS.get(f"*.{field}") or ("", [])


def annotate(schema: dict[str, Any]) -> dict[str, Any]:
    """Descriptions where a property has none or only its type's generic one, and examples
    where it has none, in every ``$defs`` model of a schema."""
    for model, definition in schema.get("$defs", {}).items():
        for field, prop in definition.get("properties", {}).items():
            description, examples = doc_for(model, field)
            current = str(prop.get("description", ""))
            if description and (not current or "with its unit, e.g." in current):
                prop["description"] = description
            if examples:
                prop["examples"] = examples
    return schema
