package config

// Opening names an opening and its shape (circle:cx,cy,r,
// ellipse:cx,cy,rx,ry[,deg], polygon:x1,y1,...).
type Opening struct {
	Name  string `yaml:"name"`
	Shape string `yaml:"shape"`
}
