"""The data dictionary: every catalog field of every part kind, in one place.

The schema (``catalog/schema.py``), the header matcher, the importer, the renderers, the
``--where`` grammar and the docs all read this module; none of them lists fields of its own.

Each :class:`Field` names its dimension key (see :mod:`partpick.units`), its value type, the
header wordings it is known by, and a one-line description. To add a field, add one entry
here: the table column, import, browse and JSON output follow.
"""

from __future__ import annotations

import re
from dataclasses import dataclass, field

from partpick.units import normalise_text, unit_dimensions

KINDS: tuple[str, ...] = ("inductor", "capacitor", "diode", "mosfet")


@dataclass(frozen=True)
class Field:
    """One catalog field.

    ``type`` is ``"float"`` (SI value in ``unit``), ``"int"``, ``"text"``, ``"enum"`` (one
    of ``choices``, reached through ``aliases``) or ``"bool"``. ``positive`` marks a value that
    cannot be zero or negative in any real part. ``magnitude`` marks a rating that p-channel
    datasheets print with a minus sign (``-30 V``); the catalog keeps its magnitude.
    ``aliases`` maps :func:`fold_text` of each accepted spelling to its choice.
    """

    name: str
    type: str
    unit: str = ""
    description: str = ""
    synonyms: tuple[str, ...] = ()
    positive: bool = False
    choices: tuple[str, ...] = ()
    aliases: dict[str, str] = field(default_factory=dict)
    required: bool = False
    magnitude: bool = False

    def __post_init__(self) -> None:
        if self.type not in ("float", "int", "text", "enum", "bool"):
            raise ValueError(f"field {self.name}: unknown type {self.type!r}")
        if self.type == "enum" and not self.choices:
            raise ValueError(f"field {self.name}: an enum needs choices")


def _enum_aliases(choices: tuple[str, ...], extra: dict[str, str]) -> dict[str, str]:
    aliases = {fold_text(c): c for c in choices}
    aliases.update({fold_text(k): v for k, v in extra.items()})
    return aliases


def fold_text(text: str) -> str:
    """Return ``text`` in lower case with every character but letters and digits removed.

    ``"Al-Electrolytic"`` gives ``"alelectrolytic"``; µ, μ and the ohm signs are folded
    first (see :func:`partpick.units.normalise_text`) and θ becomes ``theta``.
    """
    text = normalise_text(text).lower().replace("θ", "theta")
    return re.sub(r"[^0-9a-z]+", "", text)


_GROUP_RE = re.compile(r"[\(\[\{]([^\)\]\}]*)[\)\]\}]")
_TRAILING_UNIT_RE = re.compile(r",\s*([^,]+?)\s*$")


def split_header_units(text: str) -> tuple[str, tuple[str, ...]]:
    """Split a header into its words and the unit texts it carries.

    A unit is a bracketed group (``"DCR (mΩ)"``, ``"Inductance [uH]"``) or a last
    comma-separated part (``"Isat, A"``) that reads as a unit of some dimension. Groups that
    are not units (``"Saturation Current (Isat)"``, ``"Rds(on)"``) stay in the words.
    """
    units_found: list[str] = []

    def take(match: re.Match[str]) -> str:
        inner = match.group(1).strip()
        if unit_dimensions(inner):
            units_found.append(inner)
            return " "
        return match.group(0)

    words = _GROUP_RE.sub(take, text)
    trailing = _TRAILING_UNIT_RE.search(words)
    if trailing is not None and unit_dimensions(trailing.group(1)):
        units_found.append(trailing.group(1).strip())
        words = words[: trailing.start()]
    return words.strip(), tuple(units_found)


_DIELECTRIC_CODES = (
    "c0g",
    "x5r",
    "x7r",
    "x7s",
    "x6s",
    "x8r",
    "y5v",
    "al-electrolytic",
    "al-polymer",
    "ta-mno2",
    "ta-polymer",
    "film",
)
_DIELECTRIC_ALIASES = {
    "np0": "c0g",
    "npo": "c0g",
    "cog": "c0g",
    "c0g/np0": "c0g",
    "c0g (np0)": "c0g",
    "aluminum electrolytic": "al-electrolytic",
    "aluminium electrolytic": "al-electrolytic",
    "electrolytic": "al-electrolytic",
    "al electrolytic": "al-electrolytic",
    "alu electrolytic": "al-electrolytic",
    "al-e": "al-electrolytic",
    "aluminum polymer": "al-polymer",
    "aluminium polymer": "al-polymer",
    "polymer aluminum": "al-polymer",
    "conductive polymer aluminum": "al-polymer",
    "tantalum": "ta-mno2",
    "tantalum mno2": "ta-mno2",
    "ta": "ta-mno2",
    "mno2": "ta-mno2",
    "tantalum polymer": "ta-polymer",
    "polymer tantalum": "ta-polymer",
    "film": "film",
    "polypropylene": "film",
    "polyester": "film",
    "pp film": "film",
    "pet film": "film",
    "metallized film": "film",
}
_LIFECYCLE_ALIASES = {
    "production": "active",
    "in production": "active",
    "active": "active",
    "new": "active",
    "not recommended for new designs": "nrnd",
    "nrnd": "nrnd",
    "not for new designs": "nrnd",
    "last time buy": "nrnd",
    "ltb": "nrnd",
    "eol": "obsolete",
    "end of life": "obsolete",
    "discontinued": "obsolete",
    "obsolete": "obsolete",
    "unknown": "unknown",
}
_DIODE_TYPE_ALIASES = {
    "schottky": "schottky",
    "schottky barrier": "schottky",
    "sbd": "schottky",
    "fast recovery": "fast",
    "ultrafast": "fast",
    "ultra fast": "fast",
    "fast": "fast",
    "frd": "fast",
    "standard": "standard",
    "standard recovery": "standard",
    "general purpose": "standard",
    "rectifier": "standard",
    "sic": "sic",
    "silicon carbide": "sic",
    "sic schottky": "sic",
}
_CHANNEL_ALIASES = {
    "n": "n",
    "n-channel": "n",
    "nch": "n",
    "n channel": "n",
    "p": "p",
    "p-channel": "p",
    "pch": "p",
    "p channel": "p",
}

COMMON_FIELDS: tuple[Field, ...] = (
    Field(
        "mpn",
        "text",
        description="manufacturer part number",
        required=True,
        synonyms=(
            "Part Number",
            "Mfr Part Number",
            "Manufacturer Part Number",
            "MPN",
            "Mfr. Part No.",
            "Part No",
            "PN",
            "Part",
            "Order Code",
            "Item Number",
            "Article Number",
            "Article No.",
            "P/N",
            "Mfr P/N",
            "Mfr PN",
            "Mfg Part Number",
            "Manufacturer Part No.",
            "Manufacturer P/N",
            "Part Code",
            "Product Number",
            "Product Code",
            "Item Code",
            "Catalog Number",
            "Ordering Code",
            "Order Number",
            "Model Number",
        ),
    ),
    Field(
        "manufacturer",
        "text",
        description="manufacturer name",
        synonyms=(
            "Manufacturer",
            "Mfr",
            "Mfg",
            "Maker",
            "Vendor",
            "Brand",
            "Manufacturer Name",
            "Mfr Name",
            "Make",
            "Producer",
            "Vendor Name",
            "Manufacturer (Brand)",
        ),
    ),
    Field(
        "description",
        "text",
        description="free-text description",
        synonyms=(
            "Description",
            "Desc",
            "Detailed Description",
            "Product Description",
            "Part Description",
            "Item Description",
            "Short Description",
        ),
    ),
    Field(
        "package",
        "text",
        description="package or case code",
        synonyms=(
            "Package",
            "Case",
            "Package / Case",
            "Case Code",
            "Footprint",
            "Size Code",
            "Case/Package",
            "Case Size",
            "Package Type",
            "Case Style",
            "Outline",
            "Package Code",
            "Supplier Device Package",
            "Package Name",
            "EIA Case Size",
            "EIA Size Code",
            "Housing",
            "Case Type",
            "Package Size",
            "Case/Size",
        ),
    ),
    Field(
        "unit_price",
        "float",
        "currency",
        "unit price in the catalog's currency",
        synonyms=(
            "Price",
            "Unit Price",
            "Price Each",
            "Cost",
            "Unit Cost",
            "Price (1k)",
            "Price/pc",
            "Price per Piece",
            "Price per Unit",
            "Price/Unit",
            "List Price",
            "Unit Price (USD)",
        ),
        positive=True,
    ),
    Field(
        "stock",
        "int",
        "count",
        "units in stock",
        synonyms=(
            "Stock",
            "Quantity Available",
            "Qty Available",
            "On Hand",
            "Inventory",
            "Available",
            "In Stock",
            "Stock Qty",
            "Stock Quantity",
            "Available Quantity",
            "Qty On Hand",
            "Quantity in Stock",
            "Stock Level",
            "Availability",
            "Available Stock",
            "Factory Stock",
            "Inventory Qty",
            "Quantity on Hand",
            "Stock on Hand",
            "Units in Stock",
        ),
    ),
    Field(
        "lifecycle",
        "enum",
        description="lifecycle status",
        synonyms=(
            "Lifecycle",
            "Lifecycle Status",
            "Part Status",
            "Status",
            "Life Cycle",
            "Product Status",
            "Production Status",
            "Part Lifecycle",
            "Lifecycle Stage",
            "Product Lifecycle",
            "Life Cycle Status",
            "Lifecycle Phase",
        ),
        choices=("active", "nrnd", "obsolete", "unknown"),
        aliases=_enum_aliases(("active", "nrnd", "obsolete", "unknown"), _LIFECYCLE_ALIASES),
    ),
)

_SIZE_FIELDS: tuple[Field, ...] = (
    Field(
        "length_mm",
        "float",
        "mm",
        "body length",
        positive=True,
        synonyms=(
            "Length",
            "L (mm)",
            "Size Length",
            "Body Length",
            "Length (mm)",
            "Dimension L",
            "Length L",
            "Size L",
        ),
    ),
    Field(
        "width_mm",
        "float",
        "mm",
        "body width",
        positive=True,
        synonyms=(
            "Width",
            "W (mm)",
            "Size Width",
            "Body Width",
            "Dimension W",
            "Width W",
            "Size W",
        ),
    ),
    Field(
        "height_mm",
        "float",
        "mm",
        "body height (seated)",
        positive=True,
        synonyms=(
            "Height",
            "Height Seated",
            "Height - Seated (Max)",
            "Thickness",
            "H (mm)",
            "Body Height",
            "Seated Height",
            "Dimension H",
            "Height H",
            "Size H",
            "Profile Height",
            "Mounted Height",
        ),
    ),
)

_TOLERANCE = Field(
    "tolerance",
    "float",
    "fraction",
    "tolerance as a fraction (±20 % is 0.2)",
    synonyms=(
        "Tolerance",
        "Tol",
        "Tol.",
        "Inductance Tolerance",
        "Capacitance Tolerance",
        "L Tolerance",
        "C Tolerance",
        "Tolerance ±",
        "Value Tolerance",
    ),
)
_TJ_MAX = Field(
    "tj_max_degc",
    "float",
    "degC",
    "maximum junction temperature",
    synonyms=(
        "Max Junction Temperature",
        "Tj max",
        "Tjmax",
        "Operating Temperature",
        "Junction Temperature",
        "Operating Junction Temperature",
        "Tj",
        "Tj(max)",
        "T_J",
        "Maximum Junction Temperature",
        "Junction Temperature Range",
        "Operating Junction Temperature Range",
        "Operating Temperature Range",
        "Operating Junction and Storage Temperature Range",
        "Operating and Storage Junction Temperature",
        "Temperature - Operating",
        "Operating Temp",
        "Tj op",
        "Tvj",
        "Max Operating Junction Temperature",
    ),
)
_THETA_JA = Field(
    "theta_ja_degc_w",
    "float",
    "degC/W",
    "junction-to-ambient thermal resistance",
    positive=True,
    synonyms=(
        "Thermal Resistance Theta JA",
        "Theta JA",
        "RthJA",
        "Rth(j-a)",
        "Thermal Resistance Junction to Ambient",
        "θJA",
        "RθJA",
        "R_thJA",
        "Rth j-a",
        "Theta-JA",
        "ThetaJA",
        "R_θJA",
        "Rth(j-amb)",
        "Thermal Resistance, Junction-to-Ambient",
        "Junction-to-Ambient Thermal Resistance",
        "Junction to Ambient",
        "Thermal Resistance Junction-Ambient",
        "Thermal Resistance (Junction to Ambient)",
        "Thermal Resistance JA",
        "Rth JA",
        "Rthja",
        "RJA",
        "Theta J-A",
        "Thermal Impedance Junction to Ambient",
    ),
)

KIND_FIELDS: dict[str, tuple[Field, ...]] = {
    "inductor": (
        Field(
            "inductance_h",
            "float",
            "H",
            "nominal inductance",
            positive=True,
            synonyms=(
                "Inductance",
                "L",
                "Nominal Inductance",
                "Value",
                "Inductance Value",
                "L0",
                "Ind.",
                "L nom",
                "Lnom",
                "Initial Inductance",
                "Open Circuit Inductance",
                "OCL",
                "Inductance L",
                "L0 Inductance",
                "Inductance (L)",
            ),
        ),
        _TOLERANCE,
        Field(
            "isat_a",
            "float",
            "A",
            "saturation current",
            positive=True,
            synonyms=(
                "Saturation Current (Isat)",
                "Saturation Current",
                "Isat",
                "Current - Saturation",
                "Current - Saturation (Isat)",
                "I_sat",
                "I sat",
                "Sat. Current",
                "Saturation Current, Isat",
                "Saturation Current Isat",
                "Isat Current",
                "Sat Current",
                "Saturation",
                "I saturation",
            ),
        ),
        Field(
            "irms_a",
            "float",
            "A",
            "RMS (heating) current rating",
            positive=True,
            synonyms=(
                "RMS Current",
                "Irms",
                "Heating Current",
                "Temperature Rise Current",
                "I_rms",
                "I rms",
                "Current RMS",
                "RMS Current (Irms)",
                "Thermal Current",
                "Temp Rise Current",
                "Heat Rating Current",
                "Temperature Rise Current (Irms)",
                "Rated Current (Irms)",
                "Irms Current",
                "Current - RMS",
                "Heat Current",
                "Self-Heating Current",
                "Rise Current",
            ),
        ),
        Field(
            "dcr_ohm",
            "float",
            "ohm",
            "DC resistance of the winding",
            positive=True,
            synonyms=(
                "DC Resistance",
                "DCR",
                "DC Resistance (DCR)",
                "Rdc",
                "DC Resistance (DCR) Max",
                "R_DC",
                "R DC",
                "Winding Resistance",
                "Resistance",
                "Copper Resistance",
                "DC Winding Resistance",
                "DCR Resistance",
                "Resistance DC",
            ),
        ),
        Field(
            "srf_hz",
            "float",
            "Hz",
            "self-resonant frequency",
            positive=True,
            synonyms=(
                "SRF",
                "Self Resonant Frequency",
                "Frequency - Self Resonant",
                "Self-Resonant Freq.",
                "Resonant Frequency",
                "Self Res. Freq.",
                "Self Resonance",
                "SRF Frequency",
                "f_res",
                "fres",
                "Fsr",
                "f SR",
            ),
        ),
        # Core-loss data for the improved generalised Steinmetz equation (Venkatachalam et
        # al., 2002). Either k, α, β with the core volume, cross-section and turns (so the
        # flux density is B = L·i/(N·Ae)), or the loss at one sinusoidal reference point with
        # α and β; see partpick/verify/core_loss.py.
        Field(
            "core_k",
            "float",
            "number",
            "Steinmetz coefficient k: core loss density W/m³ = k·f^α·B̂^β (f in Hz, B̂ peak in T)",
            positive=True,
            synonyms=("Steinmetz k", "Core Loss Coefficient k", "Steinmetz Coefficient"),
        ),
        Field(
            "core_alpha",
            "float",
            "number",
            "Steinmetz frequency exponent α of the core material",
            positive=True,
            synonyms=("Steinmetz alpha", "Core Loss alpha"),
        ),
        Field(
            "core_beta",
            "float",
            "number",
            "Steinmetz flux-density exponent β of the core material",
            positive=True,
            synonyms=("Steinmetz beta", "Core Loss beta"),
        ),
        Field(
            "core_volume_m3",
            "float",
            "m3",
            "effective core volume Ve",
            positive=True,
            synonyms=("Core Volume", "Effective Volume", "Ve"),
        ),
        Field(
            "core_area_m2",
            "float",
            "m2",
            "effective core cross-section Ae",
            positive=True,
            synonyms=("Core Area", "Effective Area", "Ae"),
        ),
        Field(
            "turns",
            "int",
            "count",
            "number of turns of the winding",
            positive=True,
            synonyms=("Turns", "Number of Turns", "N"),
        ),
        Field(
            "core_loss_ref_w",
            "float",
            "W",
            "core loss at the reference point (sinusoidal current at core_loss_ref_hz)",
            positive=True,
            synonyms=("Core Loss", "Reference Core Loss"),
        ),
        Field(
            "core_loss_ref_hz",
            "float",
            "Hz",
            "frequency of the core-loss reference point",
            positive=True,
            synonyms=("Core Loss Frequency", "Reference Frequency"),
        ),
        Field(
            "core_loss_ref_ripple_a",
            "float",
            "A",
            "peak-to-peak sinusoidal ripple current of the core-loss reference point",
            positive=True,
            synonyms=("Core Loss Ripple Current", "Reference Ripple Current"),
        ),
        *_SIZE_FIELDS,
        Field(
            "shielded",
            "bool",
            description="magnetically shielded",
            synonyms=(
                "Shielded",
                "Shielding",
                "Shield",
                "Magnetic Shielding",
                "Shield Type",
                "Shielding Type",
                "Shielded/Unshielded",
                "Shielded (Y/N)",
                "Shielded Y/N",
            ),
        ),
    ),
    "capacitor": (
        Field(
            "capacitance_f",
            "float",
            "F",
            "nominal capacitance",
            positive=True,
            synonyms=(
                "Capacitance",
                "C",
                "Cap",
                "Nominal Capacitance",
                "Value",
                "Capacitance Value",
                "C nom",
                "Cnom",
                "Cap Value",
                "CR",
                "C_R",
                "Capacitance (C)",
            ),
        ),
        _TOLERANCE,
        Field(
            "voltage_v",
            "float",
            "V",
            "rated DC voltage",
            positive=True,
            synonyms=(
                "Voltage Rating",
                "Rated Voltage",
                "Voltage - Rated",
                "Voltage",
                "Vr",
                "WVDC",
                "Working Voltage",
                "VDC",
                "DC Voltage",
                "Rated V",
                "UR",
                "U_R",
                "Voltage - DC",
                "WV",
                "W.V.",
                "Rated Working Voltage",
                "Voltage Rating (Vr)",
                "V Rated",
                "Capacitor Voltage",
                "Voltage Class",
            ),
        ),
        Field(
            "dielectric",
            "enum",
            description="dielectric or technology code",
            synonyms=(
                "Dielectric",
                "Temperature Coefficient",
                "Technology",
                "Type",
                "Capacitor Type",
                "Material",
                "Temperature Characteristic",
                "TC Code",
                "TC",
                "Temp. Char.",
                "Dielectric Material",
                "Dielectric Type",
                "Temp Coefficient",
                "Tempco",
                "EIA Temperature Characteristic",
                "Temperature Characteristic Code",
                "TC / Tech",
                "Dielectric Code",
                "Ceramic Type",
                "Dielectric Class",
            ),
            choices=_DIELECTRIC_CODES,
            aliases=_enum_aliases(_DIELECTRIC_CODES, _DIELECTRIC_ALIASES),
        ),
        Field(
            "esr_ohm",
            "float",
            "ohm",
            "equivalent series resistance",
            positive=True,
            synonyms=(
                "ESR",
                "Equivalent Series Resistance",
                "ESR (Max)",
                "Max ESR",
                "Equivalent Series Resistance (ESR)",
                "R_ESR",
                "ESR Value",
                "Series Resistance",
                "ESR Resistance",
            ),
        ),
        Field(
            "ripple_a",
            "float",
            "A",
            "rated RMS ripple current",
            positive=True,
            synonyms=(
                "Ripple Current",
                "Ripple Current @ High Frequency",
                "Irms Ripple",
                "Max Ripple Current",
                "Ripple",
                "RMS Ripple Current",
                "Ripple Current (A rms)",
                "Ripple (A rms)",
                "I_ripple",
                "Iripple",
                "Permissible Ripple Current",
                "Allowable Ripple Current",
                "Irms",
                "RMS Current",
                "IRAC",
                "I_RAC",
                "Ripple Current Irms",
                "Ripple I_rms",
                "Ripple Current Rating",
                "Ripple I",
            ),
        ),
        Field(
            "capacitance_at_bias_f",
            "float",
            "F",
            "capacitance at the DC bias voltage bias_v, from the datasheet's DC-bias curve",
            positive=True,
            synonyms=(
                "Capacitance at Bias",
                "Capacitance at DC Bias",
                "Capacitance @ DC Bias",
                "DC Bias Capacitance",
            ),
        ),
        Field(
            "bias_v",
            "float",
            "V",
            "DC bias voltage of capacitance_at_bias_f",
            positive=True,
            synonyms=("Bias Voltage", "DC Bias Voltage"),
        ),
        Field(
            "temp_max_degc",
            "float",
            "degC",
            "maximum operating temperature",
            synonyms=(
                "Operating Temperature",
                "Max Temperature",
                "Temperature Max",
                "Operating Temperature Range",
                "Temp Max",
                "Upper Category Temperature",
                "Category Temperature",
                "Category Temperature Range",
                "Rated Temperature",
                "Max Operating Temperature",
                "Temperature Range",
                "Temperature",
                "Temperature - Operating",
                "T max",
                "Tmax",
                "Operating Temp",
                "Ambient Temperature Range",
                "Temperature Rating",
            ),
        ),
        Field(
            "life_h",
            "float",
            "h",
            "rated life at maximum temperature",
            positive=True,
            synonyms=(
                "Lifetime @ Temp.",
                "Life",
                "Lifetime",
                "Endurance",
                "Load Life",
                "Life Time",
                "Rated Life",
                "Lifetime (hrs)",
                "Endurance Life",
                "Useful Life",
                "Life Expectancy",
                "Load Life Time",
                "Operational Life",
                "Life Hours",
            ),
        ),
        *_SIZE_FIELDS,
    ),
    "diode": (
        Field(
            "diode_type",
            "enum",
            description="diode technology",
            synonyms=(
                "Diode Type",
                "Type",
                "Technology",
                "Diode Technology",
                "Rectifier Type",
                "Diode Kind",
                "Device Type",
                "Diode Family",
            ),
            choices=("schottky", "fast", "standard", "sic"),
            aliases=_enum_aliases(("schottky", "fast", "standard", "sic"), _DIODE_TYPE_ALIASES),
        ),
        Field(
            "vrrm_v",
            "float",
            "V",
            "repetitive peak reverse voltage",
            positive=True,
            synonyms=(
                "Reverse Voltage (Vrrm)",
                "Vrrm",
                "Reverse Voltage",
                "Voltage - DC Reverse (Vr) (Max)",
                "Peak Reverse Voltage",
                "VR",
                "V_RRM",
                "Repetitive Peak Reverse Voltage",
                "Peak Repetitive Reverse Voltage",
                "Maximum Repetitive Peak Reverse Voltage",
                "DC Blocking Voltage",
                "Blocking Voltage",
                "DC Reverse Voltage",
                "Max Reverse Voltage",
                "VRWM",
                "Working Peak Reverse Voltage",
                "Working Reverse Voltage",
                "PIV",
                "Peak Inverse Voltage",
                "VRM",
                "V_R",
                "Reverse Voltage (Vr)",
                "Voltage - DC Reverse",
                "Reverse Blocking Voltage",
                "Voltage - Reverse",
                "Vrrm Reverse Voltage",
                "VRRM/VR",
                "Reverse Voltage Rating",
                "Peak Reverse Repetitive Voltage",
            ),
        ),
        Field(
            "if_avg_a",
            "float",
            "A",
            "average forward current rating",
            positive=True,
            synonyms=(
                "Average Forward Current",
                "If(av)",
                "IF(AV)",
                "Forward Current",
                "Current - Average Rectified (Io)",
                "Io",
                "Average Rectified Current",
                "Average Rectified Forward Current",
                "Rectified Current",
                "Maximum Average Forward Rectified Current",
                "Average Forward Rectified Current",
                "Average Forward Current (IF(AV))",
                "IF",
                "I_F",
                "I(AV)",
                "IAV",
                "I_O",
                "IFAV",
                "I_F(AV)",
                "Forward Current (Average)",
                "Current - Average Rectified",
                "Output Rectified Current",
                "Average Rectified Output Current",
                "Average Output Rectified Current",
                "Average Output Current",
                "Mean Forward Current",
                "Forward Current IF(AV)",
                "IF Average",
            ),
        ),
        Field(
            "ifsm_a",
            "float",
            "A",
            "non-repetitive surge current",
            positive=True,
            synonyms=(
                "Surge Current",
                "Ifsm",
                "IFSM",
                "Peak Surge Current",
                "Non-Repetitive Peak Forward Surge Current",
                "Peak Forward Surge Current",
                "Forward Surge Current",
                "Surge Forward Current",
                "Non-Repetitive Peak Surge Current",
                "I_FSM",
                "Surge Current Rating",
                "Non-Repetitive Surge Current",
                "Current - Surge",
                "Surge Current (Ifsm)",
                "Non Repetitive Forward Surge Current",
                "Peak Non-Repetitive Surge Current",
                "Surge",
            ),
        ),
        Field(
            "vf_v",
            "float",
            "V",
            "forward voltage at rated current",
            positive=True,
            synonyms=(
                "Forward Voltage",
                "Vf",
                "VF",
                "Voltage - Forward (Vf) (Max) @ If",
                "Forward Voltage Drop",
                "V_F",
                "Forward Drop",
                "Voltage Drop",
                "Instantaneous Forward Voltage",
                "Maximum Instantaneous Forward Voltage",
                "Voltage - Forward",
                "Forward Voltage (Vf)",
                "Vfwd",
                "Vf Forward Voltage",
                "Forward Voltage VF",
            ),
        ),
        Field(
            "trr_s",
            "float",
            "s",
            "reverse recovery time",
            positive=True,
            synonyms=(
                "Reverse Recovery Time (trr)",
                "trr",
                "Reverse Recovery Time",
                "t_rr",
                "Recovery Time",
                "Reverse Recovery",
                "Recovery Time (trr)",
                "Reverse Recovery Time trr",
            ),
        ),
        Field(
            "qrr_c",
            "float",
            "C",
            "reverse recovery charge",
            synonyms=(
                "Reverse Recovery Charge",
                "Qrr",
                "Recovery Charge",
                "Q_rr",
                "Reverse Recovery Charge (Qrr)",
                "Recovered Charge",
                "Reverse Recovered Charge",
            ),
        ),
        Field(
            "cj_f",
            "float",
            "F",
            "junction capacitance (energy-equivalent over the blocking voltage)",
            positive=True,
            synonyms=(
                "Junction Capacitance",
                "Cj",
                "Diode Capacitance",
                "C_j",
                "Total Capacitance",
                "Capacitance",
            ),
        ),
        Field(
            "ir_a",
            "float",
            "A",
            "reverse leakage current at the rated reverse voltage, at ir_tj_degc",
            positive=True,
            synonyms=(
                "Reverse Leakage Current",
                "Ir",
                "IR",
                "Current - Reverse Leakage @ Vr",
                "Reverse Current",
                "Leakage Current",
                "Reverse Leakage",
                "I_R",
                "Reverse Current IR",
                "Current - Reverse Leakage",
            ),
        ),
        Field(
            "ir_tj_degc",
            "float",
            "degC",
            "junction temperature at which ir_a is given (25 °C where absent)",
            synonyms=("Leakage Test Temperature", "Ir Temperature"),
        ),
        _TJ_MAX,
        _THETA_JA,
    ),
    "mosfet": (
        Field(
            "channel",
            "enum",
            description="channel polarity",
            synonyms=(
                "Channel",
                "FET Type",
                "Polarity",
                "Channel Type",
                "Channel Polarity",
                "Transistor Polarity",
                "N/P Channel",
                "Polarity/Channel Type",
                "MOSFET Type",
                "Transistor Type",
                "FET Polarity",
                "N/P",
                "N-Ch/P-Ch",
            ),
            choices=("n", "p"),
            aliases=_enum_aliases(("n", "p"), _CHANNEL_ALIASES),
        ),
        Field(
            "vds_v",
            "float",
            "V",
            "drain-source breakdown voltage",
            positive=True,
            magnitude=True,
            synonyms=(
                "Drain-Source Voltage (Vds)",
                "Vds",
                "VDSS",
                "Drain to Source Voltage",
                "Drain to Source Voltage (Vdss)",
                "BVdss",
                "Drain-Source Voltage",
                "Drain-Source Breakdown Voltage",
                "V(BR)DSS",
                "BV_DSS",
                "V_DS",
                "Vdss",
                "Breakdown Voltage",
                "Drain-Source Breakdown Voltage V(BR)DSS",
                "Drain Source Voltage Vds",
                "Voltage - Drain Source",
                "Voltage - Breakdown",
                "V_DSS",
                "Drain Voltage",
                "Drain-Source Voltage Rating",
            ),
        ),
        Field(
            "id_a",
            "float",
            "A",
            "continuous drain current",
            positive=True,
            magnitude=True,
            synonyms=(
                "Continuous Drain Current (Id)",
                "Id",
                "Drain Current",
                "Current - Continuous Drain (Id)",
                "Continuous Drain Current",
                "I_D",
                "Drain Current (Continuous)",
                "Current - Continuous Drain",
                "Drain Current Id",
                "Continuous Drain Current Id",
                "ID Continuous",
                "Drain Current Rating",
            ),
        ),
        Field(
            "rds_on_ohm",
            "float",
            "ohm",
            "on resistance at rated gate drive",
            positive=True,
            synonyms=(
                "Rds(on)",
                "Rdson",
                "RDS(on)",
                "On Resistance",
                "Rds On (Max)",
                "Rds On",
                "Drain-Source On-Resistance",
                "Drain-Source On Resistance",
                "R_DS(on)",
                "Drain-Source On-State Resistance",
                "On-State Resistance",
                "Resistance Drain-Source On",
                "Rds On Resistance",
                "RDS(on) On-Resistance",
                "Drain to Source Resistance",
                "On-Resistance Rds(on)",
                "Ron",
                "R_on",
            ),
        ),
        Field(
            "vgs_th_v",
            "float",
            "V",
            "gate threshold voltage",
            positive=True,
            magnitude=True,
            synonyms=(
                "Vgs(th)",
                "Gate Threshold Voltage",
                "Vgs(th) (Max)",
                "Vth",
                "V_GS(th)",
                "Gate-Source Threshold Voltage",
                "Threshold Voltage",
                "Vgsth",
                "V_th",
                "Gate Threshold",
                "Gate Threshold Voltage Vgs(th)",
                "Vgs(th) Threshold Voltage",
                "VGS(to)",
                "Gate to Source Threshold Voltage",
                "Threshold Gate Voltage",
            ),
        ),
        Field(
            "qg_c",
            "float",
            "C",
            "total gate charge",
            positive=True,
            synonyms=(
                "Gate Charge (Qg)",
                "Qg",
                "Total Gate Charge",
                "Gate Charge (Qg) (Max) @ Vgs",
                "Gate Charge",
                "Q_g",
                "Qg(tot)",
                "Qg Total",
                "Total Gate Charge (Qg)",
                "Gate Charge Total",
                "Qgtot",
                "Q_G(TOT)",
            ),
        ),
        Field(
            "qgd_c",
            "float",
            "C",
            "gate-drain (Miller) charge",
            positive=True,
            synonyms=(
                "Qgd",
                "Gate-Drain Charge",
                "Gate Drain Charge",
                "Miller Charge",
                "Q_gd",
                "Gate-to-Drain Charge",
                "Gate-Drain (Miller) Charge",
                "Miller Plateau Charge",
                "Gate-Drain Charge (Qgd)",
                "Gate Drain Miller Charge",
                "Miller Charge Qgd",
                "Drain-Gate Charge",
            ),
        ),
        Field(
            "coss_f",
            "float",
            "F",
            "output capacitance",
            positive=True,
            synonyms=(
                "Coss",
                "Output Capacitance",
                "Output Capacitance (Coss)",
                "C_oss",
                "Output Cap",
                "Coss Output Capacitance",
                "Output Capacitance Coss",
            ),
        ),
        Field(
            "coss_er_f",
            "float",
            "F",
            "energy-related output capacitance Co(er) (stores the same ½·C·V² as Coss(v))",
            positive=True,
            synonyms=("Co(er)", "Coss(er)", "Energy Related Output Capacitance"),
        ),
        _TJ_MAX,
        _THETA_JA,
    ),
}


# Figures only the loss model reads (core loss, junction capacitance, leakage, Co(er)): kept
# in the catalog, CSV and JSON, left out of the terminal parts table so it fits 100 columns.
LOSS_MODEL_FIELDS: frozenset[str] = frozenset(
    {
        "core_k",
        "core_alpha",
        "core_beta",
        "core_volume_m3",
        "core_area_m2",
        "turns",
        "core_loss_ref_w",
        "core_loss_ref_hz",
        "core_loss_ref_ripple_a",
        "cj_f",
        "ir_a",
        "ir_tj_degc",
        "coss_er_f",
    }
)


# Wordings that could name more than one field (or a figure the catalog does not keep, the
# OTHER entry): a header worded so is never read, but told which fields it might be and the
# map-file line that settles it. "Rated Current" on an inductor may be Isat or Irms.
OTHER = "(a figure the catalog does not keep)"
_CURRENT_OF_INDUCTOR = ("isat_a", "irms_a")
AMBIGUOUS_WORDINGS: dict[str, dict[str, tuple[str, ...]]] = {
    "inductor": {
        "Current": _CURRENT_OF_INDUCTOR,
        "Rated Current": _CURRENT_OF_INDUCTOR,
        "Current Rating": _CURRENT_OF_INDUCTOR,
        "Current - Rated": _CURRENT_OF_INDUCTOR,
        "Idc": _CURRENT_OF_INDUCTOR,
        "I_DC": _CURRENT_OF_INDUCTOR,
        "Ir": _CURRENT_OF_INDUCTOR,
        "I_R": _CURRENT_OF_INDUCTOR,
        "DC Current": _CURRENT_OF_INDUCTOR,
        "Peak Current": ("isat_a", OTHER),
        "I": _CURRENT_OF_INDUCTOR,
    },
    "capacitor": {
        "Current": ("ripple_a", OTHER),
        "Rated Current": ("ripple_a", OTHER),
        "Impedance": ("esr_ohm", OTHER),
        "Resistance": ("esr_ohm", OTHER),
    },
    "diode": {
        "Current": ("if_avg_a", "ifsm_a"),
        "Rated Current": ("if_avg_a", "ifsm_a"),
        "Peak Current": ("ifsm_a", OTHER),
        "Voltage": ("vrrm_v", "vf_v"),
        "Rated Voltage": ("vrrm_v", "vf_v"),
        "Thermal Resistance": ("theta_ja_degc_w", OTHER),
        "Rth": ("theta_ja_degc_w", OTHER),
        "Temperature": ("tj_max_degc", OTHER),
        "Max Temperature": ("tj_max_degc", OTHER),
        "Charge": ("qrr_c", OTHER),
    },
    "mosfet": {
        "Current": ("id_a", OTHER),
        "Rated Current": ("id_a", OTHER),
        "Voltage": ("vds_v", "vgs_th_v"),
        "Rated Voltage": ("vds_v", "vgs_th_v"),
        "Thermal Resistance": ("theta_ja_degc_w", OTHER),
        "Rth": ("theta_ja_degc_w", OTHER),
        "Capacitance": ("coss_f", OTHER),
        "Resistance": ("rds_on_ohm", OTHER),
        "Charge": ("qg_c", "qgd_c"),
        "Temperature": ("tj_max_degc", OTHER),
        "Max Temperature": ("tj_max_degc", OTHER),
        "Threshold": ("vgs_th_v", OTHER),
    },
}


def ambiguous_wordings(kind: str) -> dict[str, tuple[str, ...]]:
    """Return wording -> the fields it might name, for the wordings of ``kind`` never read."""
    return AMBIGUOUS_WORDINGS.get(kind, {})


# A condition that changes the figure: capacitance "@ 25 V" may be the capacitance at that
# DC bias, not the nominal one measured at a small AC level.
_CONDITION_ALTERNATIVES: dict[tuple[str, str], tuple[re.Pattern[str], str]] = {
    ("capacitor", "capacitance_f"): (
        re.compile(r"\d\s*[kmuµ]?v(?:dc)?\b|\bbias\b", re.IGNORECASE),
        "capacitance_at_bias_f",
    ),
}


# A condition that says which of two fields an ambiguous header is: an inductor's "Rated
# Current (ΔT = 40 K)" is the heating current, "Current @ 30 % drop" the saturation current.
_CONDITION_SETTLES: dict[str, tuple[tuple[frozenset[str], re.Pattern[str], str], ...]] = {
    "inductor": (
        (
            frozenset(_CURRENT_OF_INDUCTOR),
            re.compile(r"\brise\b|δt|Δt|\bdelta[ -]?t\b|\bdt\b|\bheating\b", re.IGNORECASE),
            "irms_a",
        ),
        (
            frozenset(_CURRENT_OF_INDUCTOR),
            re.compile(r"\bdrop\b|roll[- ]?off|δl|Δl|\bdelta[ -]?l\b|\bdecrease\b", re.IGNORECASE),
            "isat_a",
        ),
    ),
}


def settled_by_condition(kind: str, names: frozenset[str], condition: str) -> str | None:
    """Return the one field of ``names`` that ``condition`` says a header means, if any."""
    if not condition:
        return None
    found = {
        field_name
        for candidates, pattern, field_name in _CONDITION_SETTLES.get(kind, ())
        if names == candidates and pattern.search(condition)
    }
    return found.pop() if len(found) == 1 else None


def condition_alternative(kind: str, name: str, condition: str) -> str | None:
    """Return the field a header of field ``name`` may mean under ``condition``, if any."""
    entry = _CONDITION_ALTERNATIVES.get((kind, name))
    if entry is None or not condition or not entry[0].search(condition):
        return None
    return entry[1] if any(f.name == entry[1] for f in fields_of(kind)) else None


def fields_of(kind: str) -> tuple[Field, ...]:
    """Return every field of ``kind``: the common ones, then the kind's own."""
    if kind not in KIND_FIELDS:
        raise KeyError(kind)
    return COMMON_FIELDS + KIND_FIELDS[kind]


def field_of(kind: str, name: str) -> Field:
    """Return the field ``name`` of ``kind``; raises KeyError if there is none."""
    for f in fields_of(kind):
        if f.name == name:
            return f
    raise KeyError(name)


# "inferred" maps a field whose value the importer read from another column (a diode type
# from the description) to that column; None where every value came from its own column.
PROVENANCE_COLUMNS: tuple[str, ...] = (
    "source_file",
    "source_sha256",
    "imported_at",
    "source_line",
    "inferred",
)
