package xlsx

import (
	"furlong/export"
	"furlong/trial"
)

// writeOperations writes the trial's log of operations: one row per entry
// in date order, under the column heads of export.OperationColumns, with
// the crop-protection cautions when the log holds an application.
func (r *report) writeOperations(name string) error {
	s := newSheet(r.f, r.st, name)
	s.textNoWidth(1, 1, "Log of operations", titleStyle)
	s.textNoWidth(1, 2, "What was done on the trial, day by day, as recorded (products and rates as typed from their labels; weather at application: air temperature, wind speed and direction, relative humidity).", noteStyle)
	row := 3
	if export.HasApplication(r.t.Operations) {
		s.textNoWidth(1, row, "Caution: "+export.ProtectionCautionText(), noteStyle)
		row++
	}
	row++
	head := row
	for i, h := range export.OperationColumns {
		k := headStyle
		if h == "Water (L/ha)" {
			k = headNumStyle
		}
		s.text(1+i, row, h, k)
	}
	row++
	for _, o := range r.t.Operations {
		cells := export.OperationRow(o)
		for i, c := range cells {
			switch {
			case export.OperationColumns[i] == "Water (L/ha)" && o.WaterVolume != nil:
				s.num(1+i, row, *o.WaterVolume, styleKey{})
			case i == 1:
				s.text(1+i, row, c, styleKey{bold: o.Kind == trial.OpApplication})
			default:
				s.text(1+i, row, c, styleKey{})
			}
		}
		row++
	}
	s.freeze(head, 0)
	s.fitColumns(8, 40)
	s.printSetup(r.opts.Paper, true, r.t.Title+": log of operations")
	s.printTitles(head)
	return s.err
}
