"""The signed-off checklist as a PDF, built with ReportLab's platypus from an Assessment, its
findings and the sign-off register; it computes no physics.

Sections, in order: first page (what, where, who, fingerprint, findings at a glance, what to
settle first); findings with their cautions; the checklist with tick boxes; keep-out maps;
figure tables; methods and assumptions; thresholds with sources, references and the deferral;
the sign-off block. Every page carries the title, the short fingerprint and "page x of y".
"""
from reports.pdf.document import render_pdf
from reports.pdf.inputs import ReportInputs, creation_epoch, inputs_from_setup

__all__ = ["render_pdf", "ReportInputs", "inputs_from_setup", "creation_epoch"]
