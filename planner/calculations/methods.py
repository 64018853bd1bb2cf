"""The idealisations behind the figures (and which way each errs), and the papers they rest on.

Plain text for the report's methods section; chosen by what the assessment actually contains.
"""
from __future__ import annotations

from planner.assessment import Assessment
from planner.setup import Setup

FIELDS = [
    "Derby & Olbert, Cylindrical magnets and ideal solenoids, Am. J. Phys. 78, 229-235 (2010)",
    "Caciagli, Baars, Philipse & Kuipers, J. Magn. Magn. Mater. 456, 423-432 (2018) (diametral cylinders)",
    "Engel-Herbert & Hesjedal, J. Appl. Phys. 97, 074504 (2005) (cuboids)",
    "Camacho & Sosa, Rev. Mex. Fis. E 59, 8-17 (2013) (on-axis fields, pole-face field)",
    "Bulirsch, Numer. Math. 13, 305-315 (1969) (generalized complete elliptic integral)",
]
FORCES = [
    "Akoun & Yonnet, IEEE Trans. Magn. 20(5), 1962-1964 (1984) (parallel cuboids)",
    "Vokoun, Beleggia, Heller & Sittner, J. Magn. Magn. Mater. 321, 3758-3763 (2009) (coaxial cylinders)",
    "Furlani, Permanent Magnet and Electromechanical Devices, Academic Press (2001) (charge model, images)",
]
PROJECTILES = ["Schenck, Safety of strong, static magnetic fields, J. Magn. Reson. Imaging 12, 2-19 (2000)",
               "ASTM F2052 (magnetically induced displacement force)",
               "Osborn, Demagnetizing factors of the general ellipsoid, Phys. Rev. 67, 351-357 (1945)"]
INDUCTION = ["Maxwell, A Treatise on Electricity and Magnetism (1873), mutual inductance of coaxial circles",
             "Grover, Inductance Calculations (1946) (Nagaoka's coefficient)",
             "Wheeler, Proc. IRE 16, 1398 (1928)",
             "Babic, Sirois, Akyel & Girardi, IEEE Trans. Magn. 46, 3591-3600 (2010)"]
TUBES = ["MacLatchy, Backman & Bogan, Am. J. Phys. 61, 1096 (1993)",
         "Iniguez, Raposo, Flores, Zamora & Perez, Eur. J. Phys. 25, 593-604 (2004)"]
SHEETS = ["Reitz, J. Appl. Phys. 41, 2067 (1970)", "Saslow, Am. J. Phys. 60, 693 (1992)"]
SMALL_MAGNETS = ["ASTM F963 4.38 and 8.25 (flux index)", "16 CFR 1501.4 (small-parts cylinder)"]


def assumptions(setup: Setup, assessment: Assessment) -> list[str]:
    """Each idealisation used, with the direction in which it errs."""
    items = [
        "Magnets are uniformly magnetized, with polarization equal to the top of the grade's remanence range and "
        "recoil permeability 1: fields and forces come out a few percent high, the safe side for keep-out lines "
        "and pinch figures.",
        "Keep-out distances are proven upper bounds: the exact distance is never larger, and normally at most 5 % "
        "or 5 mm smaller (more where the proof's budget ran out). Several magnets' fields are added; a point is "
        "counted for the magnet whose centre is nearest.",
        "The pole-face field is taken at the centre of the face; near a face's rim the field can be higher.",
    ]
    if assessment.pairs:
        items.append("Magnet pairs are assessed pole to pole, the arrangement magnets take when they jump together: "
                     "the largest pull, so snap distances and pinch energies err long and high.")
        items.append("Forces toward a steel surface use the method of images (infinitely permeable, unsaturated, "
                     "large steel): an upper bound, right for pinch hazards and wrong for holding-force claims.")
        items.append("Bench friction, the force a hand can control and the finger thickness are common-practice "
                     "figures unless the site rules give its own.")
    if assessment.projectiles:
        items.append("Loose steel items are taken as aligned with the field (the worst case), with the smaller of the "
                     "unsaturated and saturated induced moments.")
    if assessment.induction:
        items.append("Coils are ideal current sheets without round-wire corrections; tube drag is the value deep inside "
                     "the tube (ends ignored, so the fall time is slightly short); sheet drag is the low-speed value "
                     "(flagged where the speed is not small).")
    if assessment.shipping:
        items.append("A package's field is that of all its magnets aligned, as one dipole at its centre: an upper bound.")
    return items


def references(assessment: Assessment) -> list[str]:
    """Papers and standards behind the figures this assessment contains."""
    found = list(FIELDS) + list(SMALL_MAGNETS)
    if assessment.pairs:
        found += FORCES
    if assessment.projectiles:
        found += PROJECTILES
    kinds = {item.kind for item in assessment.induction}
    if kinds & {"pass_through_coil", "couple_coils", "switch_off", "crank_generator"}:
        found += INDUCTION
    if "drop_through_tube" in kinds:
        found += TUBES
    if "swing_over_sheet" in kinds:
        found += SHEETS
    return found
