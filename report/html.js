// Filters of the coefaudit HTML report: by outcome (checkboxes) and by
// study (a select), over the table's lines and the claims' cards. The
// initial filter comes from the URL fragment or query, e.g.
// #outcome=unsupported,missed&study=Lee%202019; a change is written back
// to the fragment so that the view can be shared. Items filtered out get
// the hidden attribute and data-filtered="out". The summary and the
// filters, written after the claims (the page is written as the claims
// are audited), are moved before the table of claims.
(function () {
  "use strict";
  var form = document.getElementById("filters");
  var study = document.getElementById("study-filter");
  var count = document.getElementById("shown-count");
  var reset = document.getElementById("filter-reset");
  if (!form || !study || !count) {
    return;
  }
  var index = document.getElementById("index");
  var summary = document.getElementById("summary");
  if (index) {
    if (summary) {
      index.parentNode.insertBefore(summary, index);
    }
    index.parentNode.insertBefore(form, index);
  }
  var boxes = Array.prototype.slice.call(form.querySelectorAll('input[name="outcome"]'));
  var items = Array.prototype.slice.call(document.querySelectorAll("[data-outcome]"));
  var lines = items.filter(function (e) { return e.tagName === "TR"; });

  function decode(s) {
    try {
      return decodeURIComponent(s.replace(/\+/g, " "));
    } catch (e) {
      return s;
    }
  }

  // params reads key=value pairs from the query, then the fragment.
  function params() {
    var p = {};
    [location.search.slice(1), location.hash.slice(1)].forEach(function (s) {
      s.split("&").forEach(function (kv) {
        if (kv === "") {
          return;
        }
        var i = kv.indexOf("=");
        var k = decode(i < 0 ? kv : kv.slice(0, i)).toLowerCase();
        p[k] = decode(i < 0 ? "" : kv.slice(i + 1));
      });
    });
    return p;
  }

  function writeFragment() {
    var chosen = boxes.filter(function (b) { return b.checked; }).map(function (b) { return b.value; });
    var parts = [];
    if (chosen.length !== boxes.length) {
      parts.push("outcome=" + chosen.map(encodeURIComponent).join(","));
    }
    if (study.value !== "") {
      parts.push("study=" + encodeURIComponent(study.value));
    }
    var url = location.pathname + location.search + (parts.length ? "#" + parts.join("&") : "");
    try {
      history.replaceState(null, "", url);
    } catch (e) {
      // A page opened from some sandboxes cannot rewrite its URL; the filter still works.
    }
  }

  function apply() {
    var want = {};
    boxes.forEach(function (b) { want[b.value] = b.checked; });
    var s = study.value;
    // Only the items whose state changes are touched: a page of many
    // claims opens with none filtered out.
    items.forEach(function (e) {
      var hide = !(want[e.getAttribute("data-outcome")] === true && (s === "" || e.getAttribute("data-study") === s));
      if (e.hidden === hide) {
        return;
      }
      e.hidden = hide;
      if (hide) {
        e.setAttribute("data-filtered", "out");
      } else {
        e.removeAttribute("data-filtered");
      }
    });
    var shown = lines.filter(function (e) { return !e.hidden; }).length;
    count.textContent = "Showing " + shown + " of " + lines.length + (lines.length === 1 ? " claim" : " claims");
  }

  var p = params();
  if (p.outcome !== undefined) {
    var set = {};
    p.outcome.split(",").forEach(function (o) { set[o.trim().toLowerCase()] = true; });
    boxes.forEach(function (b) { b.checked = set[b.value] === true; });
  }
  if (p.study !== undefined) {
    Array.prototype.forEach.call(study.options, function (o) {
      if (o.value === p.study) {
        study.value = o.value;
      }
    });
  }
  form.hidden = false;
  form.addEventListener("change", function () {
    apply();
    writeFragment();
  });
  if (reset) {
    reset.addEventListener("click", function () {
      boxes.forEach(function (b) { b.checked = true; });
      study.value = "";
      apply();
      writeFragment();
    });
  }
  apply();
})();
