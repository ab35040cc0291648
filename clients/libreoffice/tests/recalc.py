"""Recalculates spreadsheets in a real, headless LibreOffice Calc and reports their cells as JSON.

Usage: python3 recalc.py SPEC.json RESULT.json, with a Python that has LibreOffice's uno module (Debian: python3-uno).

SPEC: {"soffice": path, "profile": file URL of the user profile (the extension installed there with unopkg add),
       "settings": {name: value} for /org.flowsolve.calc.Settings/Service (optional),
       "trustedFolder": a folder whose files may update their links (WEBSERVICE cells) as they open (optional),
       "documents": [{"name": ..., "path": a file to open, or absent for a new document,
                      "sheet": sheet name (optional), "cells": {address: {"number"|"text"|"formula": ...}},
                      "read": [address, ...], "againAfter": seconds (optional: recalculate again after a pause)}]}
RESULT: {"version": LibreOffice's version, "documents": {name: {"seconds": one full recalculation, "againSeconds",
          "cells": {address: {"type", "result" (VALUE, TEXT, ERROR or EMPTY), "value", "string", "error", "formula"}}}}}

Automatic calculation is off while cells are written, so the timed calculateAll() is the one recalculation.
Used by tests/FlowSolve.Api.Tests/Samples/CalcExtensionTests.cs.
"""

import json
import os
import signal
import subprocess
import sys
import time
import uuid

import uno
from com.sun.star.beans import PropertyValue
from com.sun.star.connection import NoConnectException
from com.sun.star.lang import DisposedException


def prop(name, value):
    p = PropertyValue()
    p.Name = name
    p.Value = value
    return p


def connect(pipe, process, deadline):
    local = uno.getComponentContext()
    resolver = local.ServiceManager.createInstanceWithContext("com.sun.star.bridge.UnoUrlResolver", local)
    while True:
        try:
            return resolver.resolve("uno:pipe,name=%s;urp;StarOffice.ComponentContext" % pipe)
        except NoConnectException:
            if process.poll() is not None:
                raise SystemExit("soffice exited with %s before accepting a connection" % process.returncode)
            if time.monotonic() > deadline:
                raise SystemExit("soffice did not accept a connection within the time limit")
            time.sleep(0.25)


def configure(ctx, path, values):
    provider = ctx.ServiceManager.createInstanceWithContext("com.sun.star.configuration.ConfigurationProvider", ctx)
    access = provider.createInstanceWithArguments("com.sun.star.configuration.ConfigurationUpdateAccess", (prop("nodepath", path),))
    for name, value in values.items():
        if isinstance(value, uno.Any):
            uno.invoke(access, "setPropertyValue", (name, value))
        else:
            access.setPropertyValue(name, value)
    access.commitChanges()


def trust_folder(ctx, folder):
    """Files in this folder may update their links (WEBSERVICE cells) as they open: the folder becomes a trusted
    location and Calc's "update links when opening" becomes "always", as a person would set them in the options."""
    url = uno.systemPathToFileUrl(os.path.abspath(folder))
    configure(ctx, "/org.openoffice.Office.Common/Security/Scripting", {"SecureURL": uno.Any("[]string", (url,))})
    configure(ctx, "/org.openoffice.Office.Calc/Content/Update", {"Link": 0})


def office_version(ctx):
    provider = ctx.ServiceManager.createInstanceWithContext("com.sun.star.configuration.ConfigurationProvider", ctx)
    product = provider.createInstanceWithArguments(
        "com.sun.star.configuration.ConfigurationAccess", (prop("nodepath", "/org.openoffice.Setup/Product"),))
    return "%s %s" % (product.getPropertyValue("ooName"), product.getPropertyValue("ooSetupVersionAboutBox"))


FORMULA_RESULTS = {1: "VALUE", 2: "TEXT", 4: "ERROR"}  # com.sun.star.sheet.FormulaResult


def read_cell(cell):
    kind = cell.getType().value  # EMPTY, VALUE, TEXT or FORMULA
    result = FORMULA_RESULTS.get(cell.getPropertyValue("FormulaResultType2"), "?") if kind == "FORMULA" else kind
    return {"type": kind, "result": result, "value": cell.getValue(), "string": cell.getString(), "error": cell.getError(),
            "formula": cell.getFormula() if kind == "FORMULA" else None}


def recalculate(doc):
    started = time.monotonic()
    doc.calculateAll()
    return time.monotonic() - started


def run_document(desktop, spec):
    if spec.get("path"):
        url = uno.systemPathToFileUrl(os.path.abspath(spec["path"]))
        # FULL_UPDATE: links (WEBSERVICE cells) are updated as the file opens, as "Allow updating" does for a person;
        # without it they show Err:540 (external content disabled).
        doc = desktop.loadComponentFromURL(url, "_blank", 0, (prop("Hidden", True), prop("UpdateDocMode", 3)))
    else:
        doc = desktop.loadComponentFromURL("private:factory/scalc", "_blank", 0, (prop("Hidden", True),))
    if doc is None:
        raise SystemExit("could not open %s" % spec.get("path", "a new spreadsheet"))
    try:
        doc.enableAutomaticCalculation(False)
        sheets = doc.getSheets()
        sheet = sheets.getByName(spec["sheet"]) if spec.get("sheet") else sheets.getByIndex(0)
        for address, content in spec.get("cells", {}).items():
            cell = sheet.getCellRangeByName(address)
            if "number" in content:
                cell.setValue(content["number"])
            elif "text" in content:
                cell.setString(content["text"])
            else:
                cell.setFormula(content["formula"])
        result = {"seconds": recalculate(doc)}
        if spec.get("againAfter"):
            # A later recalculation, past the functions' recalculation window: every call is asked (or revalidated)
            # again; the cells are read after it.
            time.sleep(spec["againAfter"])
            result["againSeconds"] = recalculate(doc)
        result["cells"] = {address: read_cell(sheet.getCellRangeByName(address)) for address in spec.get("read", [])}
        return result
    finally:
        doc.close(True)


def main(spec_path, result_path):
    with open(spec_path, encoding="utf-8") as f:
        spec = json.load(f)
    pipe = "flowsolve-" + uuid.uuid4().hex
    command = [spec["soffice"], "--headless", "--invisible", "--nologo", "--norestore", "--nodefault", "--nolockcheck",
               "-env:UserInstallation=" + spec["profile"], "--accept=pipe,name=%s;urp;StarOffice.ComponentContext" % pipe]
    # A session of its own, so the whole office (the launcher and soffice.bin) can be stopped together.
    process = subprocess.Popen(command, stdin=subprocess.DEVNULL, start_new_session=True)
    try:
        ctx = connect(pipe, process, time.monotonic() + 90)
        desktop = ctx.ServiceManager.createInstanceWithContext("com.sun.star.frame.Desktop", ctx)
        if spec.get("settings"):
            configure(ctx, "/org.flowsolve.calc.Settings/Service", spec["settings"])
        if spec.get("trustedFolder"):
            trust_folder(ctx, spec["trustedFolder"])
        result = {"version": office_version(ctx), "documents": {}}
        for document in spec["documents"]:
            result["documents"][document["name"]] = run_document(desktop, document)
        with open(result_path, "w", encoding="utf-8") as f:
            json.dump(result, f, indent=1)
        try:
            desktop.terminate()
        except DisposedException:
            pass  # the bridge closes as the office ends
        process.wait(timeout=60)
    finally:
        if process.poll() is None:
            os.killpg(process.pid, signal.SIGKILL)
            process.wait()


if __name__ == "__main__":
    if len(sys.argv) != 3:
        raise SystemExit(__doc__)
    main(sys.argv[1], sys.argv[2])
